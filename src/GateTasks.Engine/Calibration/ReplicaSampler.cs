using GateTasks.Engine.Histograms;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// Draws the histogram of n unit-weight events from cell probabilities: a multinomial draw by successive binomials
/// (each cell given what the earlier cells left), so a replica costs one draw per cell, not per event.
/// </summary>
internal static class ReplicaSampler
{
    public static Histogram Draw(Axis axis, ReadOnlySpan<double> probabilities, long events, Random rng)
    {
        var counts = Array.ConvertAll(MultinomialCounts.Draw(probabilities, events, rng), k => (double)k);
        return Histogram.FromCells(axis, counts, counts, events, 0, 0, 0);
    }

    /// <summary>
    /// One binomial draw in time independent of n: inversion of the CDF (Kachitvichyanukul &amp; Schmeiser 1988,
    /// algorithm BINV) while the expected count of the rarer outcome is small, and the normal approximation
    /// (De Moivre–Laplace) rounded to a count above that, where its error is far below the replicas' own noise.
    /// </summary>
    internal static long Binomial(Random rng, double p, long n)
    {
        var flip = p > 0.5;
        var q = flip ? 1 - p : p;
        long k;
        if (n * q < 30)
        {
            var ratio = q / (1 - q);
            var prob = Math.Pow(1 - q, n);
            var u = rng.NextDouble();
            k = 0;
            while (u > prob && k < n)
            {
                u -= prob;
                prob *= ratio * (n - k) / (k + 1);
                k++;
            }
        }
        else
        {
            var x = n * q + Math.Sqrt(n * q * (1 - q)) * Normal.Sample(rng, 0, 1);
            k = Math.Clamp((long)Math.Round(x), 0, n);
        }
        return flip ? n - k : k;
    }
}
