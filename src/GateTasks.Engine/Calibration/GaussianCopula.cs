using GateTasks.Engine.Histograms;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// Points of a pair drawn from a Gaussian copula (Nelsen 2006, §2.3; normal scores with correlation r) with the two
/// reference histograms as marginals. r is fitted to the reference's Spearman ρ through r = 2 sin(π ρ / 6), the
/// Spearman coefficient of a bivariate normal (Pearson 1907; Kruskal 1958), so the copula reproduces the stored rank
/// correlation; each normal score is mapped through the marginal's inverse CDF (linear within a bin, under- and
/// overflow at the axis ends).
/// </summary>
internal static class GaussianCopula
{
    public static (double[] X, double[] Y) Draw(Histogram first, Histogram second, double spearman, int points, Random rng)
    {
        var r = Math.Clamp(2 * Math.Sin(Math.PI * spearman / 6), -1, 1);
        var s = Math.Sqrt(1 - r * r);
        var x = new double[points];
        var y = new double[points];
        for (var i = 0; i < points; i++)
        {
            var z1 = Normal.Sample(rng, 0, 1);
            var z2 = r * z1 + s * Normal.Sample(rng, 0, 1);
            x[i] = Quantile(first, Normal.CDF(0, 1, z1));
            y[i] = Quantile(second, Normal.CDF(0, 1, z2));
        }
        return (x, y);
    }

    /// <summary>The inverse of the histogram's CDF at probability u (negative cells counted as empty).</summary>
    internal static double Quantile(Histogram h, double u)
    {
        var edges = h.Axis.Edges;
        var w = MultinomialCounts.Normalised(h.SumW);
        var c = w[0];
        if (u <= c) return edges[0];
        for (var b = 0; b < edges.Length - 1; b++)
        {
            var p = w[b + 1];
            if (u <= c + p) return p > 0 ? edges[b] + (u - c) / p * (edges[b + 1] - edges[b]) : edges[b];
            c += p;
        }
        return edges[^1];
    }
}
