using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Two-sample Anderson–Darling test (Scholz &amp; Stephens 1987, tie-adjusted form) on the binned distributions,
/// flows included, each bin one distinct value. Weighted histograms enter as <see cref="EffectiveCounts"/>. A goodness-of-fit test:
/// its p-value joins the contract's family.
/// </summary>
internal static class AndersonDarlingTestCheck
{
    public static Measurement Evaluate(FeatureComparison c)
    {
        var reference = EffectiveCounts.Of(Cells.Of(c.Reference.Histogram));
        var sample = EffectiveCounts.Of(Cells.Of(c.Surrogate));
        var (a2, sigma, t, p) = AndersonDarling.TieAdjustedFromCounts([reference, sample]);
        return new Measurement(t, double.NaN, double.NaN, p,
            $"Anderson–Darling A²akN {InvariantNumber.Short(a2)}, T {InvariantNumber.Short(t)}, p-value {InvariantNumber.Short(p)}",
            [new("a2akn", InvariantNumber.Exact(a2)), new("sigma_n", InvariantNumber.Exact(sigma))]);
    }
}
