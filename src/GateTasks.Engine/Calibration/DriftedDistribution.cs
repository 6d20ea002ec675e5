using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// Cell probabilities of a feature's true distribution, taken to be its reference histogram (density uniform within
/// each bin), optionally distorted by a <see cref="Drift"/>. A scale or width change maps values through
/// x ↦ g(x), so its cell probabilities are F(g⁻¹(upper)) − F(g⁻¹(lower)) with F the reference's piecewise-linear CDF.
/// </summary>
internal static class DriftedDistribution
{
    public static double[] CellProbabilities(ReferenceFeature feature, IReadOnlyList<bool> coreBins, Drift drift)
    {
        var h = feature.Histogram;
        var total = h.TotalSumW;
        var p = h.SumW.ToArray().Select(x => Math.Max(0, x) / total).ToArray();
        switch (drift.Kind)
        {
            case DriftKind.Scale:
                return Mapped(h.Axis, p, x => x / (1 + drift.Size));
            case DriftKind.Width:
                var mean = feature.Summary.Mean;
                return Mapped(h.Axis, p, x => mean + (x - mean) / (1 + drift.Size));
            case DriftKind.TailDeficit:
                for (var b = 0; b < coreBins.Count; b++)
                    if (!coreBins[b]) p[b + 1] *= 1 - drift.Size;
                p[0] *= 1 - drift.Size;
                p[^1] *= 1 - drift.Size;
                return Normalised(p);
            case DriftKind.SpikeFraction:
                var top = Array.IndexOf(p, p.Max());
                var moved = Math.Min(drift.Size, p[top]);
                var rest = 1 - p[top];
                for (var i = 0; i < p.Length; i++)
                    p[i] = i == top ? p[i] - moved : rest > 0 ? p[i] + moved * p[i] / rest : p[i];
                return Normalised(p);
            default:
                return p;
        }
    }

    /// <summary>Probabilities after the map x ↦ g(x), given its inverse, with the CDF linear inside each bin.</summary>
    private static double[] Mapped(Axis axis, double[] p, Func<double, double> inverse)
    {
        var edges = axis.Edges.ToArray();
        // Underflow mass sits at the lower edge, overflow mass at the upper edge.
        double Cdf(double x) => CellCdf.At(edges, p, x);
        var q = new double[p.Length];
        q[0] = Cdf(inverse(edges[0]));
        for (var b = 0; b < edges.Length - 1; b++) q[b + 1] = Cdf(inverse(edges[b + 1])) - Cdf(inverse(edges[b]));
        q[^1] = 1 - Cdf(inverse(edges[^1]));
        for (var i = 0; i < q.Length; i++) q[i] = Math.Max(0, q[i]);
        return Normalised(q);
    }

    private static double[] Normalised(double[] p)
    {
        var s = p.Sum();
        return p.Select(x => x / s).ToArray();
    }
}
