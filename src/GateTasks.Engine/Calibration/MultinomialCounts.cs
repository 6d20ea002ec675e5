namespace GateTasks.Engine.Calibration;

/// <summary>
/// A multinomial draw of n events over cells by successive binomials (each cell given what the earlier cells left),
/// one binomial per cell: a replica costs one draw per cell, not per event.
/// </summary>
internal static class MultinomialCounts
{
    public static long[] Draw(ReadOnlySpan<double> probabilities, long events, Random rng)
    {
        var counts = new long[probabilities.Length];
        var left = events;
        var mass = 1.0;
        for (var i = 0; i < probabilities.Length && left > 0; i++)
        {
            if (i == probabilities.Length - 1 || mass <= 0)
            {
                counts[i] = left;
                break;
            }
            var p = Math.Clamp(probabilities[i] / mass, 0, 1);
            var k = p >= 1 ? left : p <= 0 ? 0 : ReplicaSampler.Binomial(rng, p, left);
            counts[i] = k;
            left -= k;
            mass -= probabilities[i];
        }
        return counts;
    }

    /// <summary>Probabilities proportional to the non-negative part of <paramref name="weights"/>.</summary>
    public static double[] Normalised(ReadOnlySpan<double> weights)
    {
        var p = new double[weights.Length];
        var total = 0.0;
        for (var i = 0; i < p.Length; i++) total += p[i] = Math.Max(0, weights[i]);
        if (total > 0) for (var i = 0; i < p.Length; i++) p[i] /= total;
        return p;
    }
}
