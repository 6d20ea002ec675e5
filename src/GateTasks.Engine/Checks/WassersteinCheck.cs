using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Wasserstein-1 distance between the two histograms (density uniform within each bin; under- and overflow counted
/// at the axis ends), divided by the reference's unbinned standard deviation so one tolerance reads the same for
/// every feature. Its uncertainty comes from <see cref="HistogramBootstrap"/>.
/// </summary>
internal static class WassersteinCheck
{
    public static Measurement Evaluate(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        var edges = c.Reference.Histogram.Axis.Edges.ToArray();
        var sigma = c.Reference.Summary.StandardDeviation;
        if (!(sigma > 0))
            return Measurement.Impossible("the reference's standard deviation is zero, so W1/σ is undefined; use ratio-max or ks-max for this feature", []);
        double Distance(double[] a, double[] b) => Wasserstein.Histograms(edges, Folded(a), Folded(b)) / sigma;
        var reference = Cells.Of(c.Reference.Histogram);
        var surrogate = Cells.Of(c.Surrogate);
        var value = Distance(reference.SumW, surrogate.SumW);
        var se = HistogramBootstrap.StandardErrors(reference, surrogate, Distance, HistogramBootstrap.Seed(c.Spec.Name, spec.Key));
        return EffectBounds.FromStandardError(value, se, spec, decision, c.Surrogate.Entries,
            $"W1/σ_ref {InvariantNumber.Short(value)}",
            [new("w1", InvariantNumber.Exact(value * sigma)), new("reference_std", InvariantNumber.Exact(sigma))]);
    }

    /// <summary>Regular bins with the underflow added to the first and the overflow to the last.</summary>
    private static double[] Folded(double[] cells)
    {
        var bins = cells[1..^1];
        bins[0] += cells[0];
        bins[^1] += cells[^1];
        return bins;
    }
}
