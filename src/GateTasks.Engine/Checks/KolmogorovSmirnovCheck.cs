using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Largest distance between the normalised cumulative distributions of the two histograms, at the bin
/// edges (Kolmogorov 1933, Smirnov 1939). Binning makes it a lower bound of the unbinned distance.
/// </summary>
internal static class KolmogorovSmirnovCheck
{
    public static CheckOutcome Evaluate(FeatureComparison c, Contracts.CheckSpec spec)
    {
        var reference = c.Reference.Histogram;
        var d = KolmogorovSmirnov.BinnedDistance(reference.Storage.SumW, c.Surrogate.Storage.SumW);
        var p = KolmogorovSmirnov.BinnedPValue(d, Kish(reference.TotalSumW, reference.TotalSumW2), Kish(c.Surrogate.TotalSumW, c.Surrogate.TotalSumW2));
        return CheckOutcome.Decide(c.Spec, spec, d,
            $"KS distance {InvariantNumber.Short(d)} {(d <= spec.Limit ? "≤" : ">")} {InvariantNumber.Short(spec.Limit)}",
            [new("distance", InvariantNumber.Exact(d)), new("p_value_asymptotic", InvariantNumber.Exact(p))]);
    }

    internal static double Kish(double sumW, double sumW2) => sumW2 > 0 ? sumW * sumW / sumW2 : 0;
}
