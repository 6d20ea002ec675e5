using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Wasserstein-1 distance between the two histograms (density uniform within each bin; under- and overflow
/// counted at the axis ends), divided by the reference's unbinned standard deviation so one tolerance reads
/// the same for every feature.
/// </summary>
internal static class WassersteinCheck
{
    public static CheckOutcome Evaluate(FeatureComparison c, Contracts.CheckSpec spec)
    {
        var reference = Folded(c.Reference.Histogram.Storage.SumW);
        var surrogate = Folded(c.Surrogate.Storage.SumW);
        var w1 = Wasserstein.Histograms(c.Reference.Histogram.Axis.Edges, reference, surrogate);
        var sigma = c.Reference.Summary.StandardDeviation;
        var value = sigma > 0 ? w1 / sigma : double.PositiveInfinity;
        return CheckOutcome.Decide(c.Spec, spec, value,
            $"W1/σ_ref {InvariantNumber.Short(value)} {(value <= spec.Limit ? "≤" : ">")} {InvariantNumber.Short(spec.Limit)} (W1 {InvariantNumber.Short(w1)}, σ_ref {InvariantNumber.Short(sigma)})",
            [new("w1", InvariantNumber.Exact(w1)), new("reference_std", InvariantNumber.Exact(sigma))]);
    }

    /// <summary>Regular bins with the underflow added to the first and the overflow to the last.</summary>
    private static double[] Folded(ReadOnlySpan<double> cells)
    {
        var bins = cells[1..^1].ToArray();
        bins[0] += cells[0];
        bins[^1] += cells[^1];
        return bins;
    }
}
