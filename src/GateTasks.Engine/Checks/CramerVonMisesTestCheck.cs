using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Two-sample Cramér–von Mises test (Anderson 1962) on the binned distributions, flows included, with its
/// asymptotic p-value; weighted histograms as effective counts (an approximation). A goodness-of-fit test: its
/// p-value joins the contract's family.
/// </summary>
internal static class CramerVonMisesTestCheck
{
    public static Measurement Evaluate(FeatureComparison c)
    {
        var (t, p) = CramerVonMises.FromCounts(EffectiveCounts.Of(Cells.Of(c.Reference.Histogram)), EffectiveCounts.Of(Cells.Of(c.Surrogate)));
        return new Measurement(t, double.NaN, double.NaN, p,
            $"Cramér–von Mises T {InvariantNumber.Short(t)}, p-value {InvariantNumber.Short(p)}", [new("t", InvariantNumber.Exact(t))]);
    }
}
