using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Two-sample Anderson–Darling test (Scholz &amp; Stephens 1987, tie-adjusted form) on the binned distributions,
/// flows included, each bin one distinct value. Weighted histograms enter as effective counts: each cell's Σw
/// scaled by the histogram's (Σw)/Σw², which keeps Kish's effective size (an approximation). A goodness-of-fit test:
/// its p-value joins the contract's family.
/// </summary>
internal static class AndersonDarlingTestCheck
{
    public static Measurement Evaluate(FeatureComparison c)
    {
        var reference = Effective(Cells.Of(c.Reference.Histogram));
        var sample = Effective(Cells.Of(c.Surrogate));
        var (a2, sigma, t, p) = AndersonDarling.TieAdjustedFromCounts([reference, sample]);
        return new Measurement(t, double.NaN, double.NaN, p, double.NaN,
            $"Anderson–Darling A²akN {InvariantNumber.Short(a2)}, T {InvariantNumber.Short(t)}, p-value {InvariantNumber.Short(p)}",
            [new("a2akn", InvariantNumber.Exact(a2)), new("sigma_n", InvariantNumber.Exact(sigma))]);
    }

    private static double[] Effective(CellContents cells)
    {
        if (FeatureComparison.IsUnweighted(cells)) return cells.SumW;
        var w = cells.SumW.Sum();
        var w2 = cells.SumW2.Sum();
        var scale = w2 > 0 ? w / w2 : 1;
        return cells.SumW.Select(x => Math.Max(0, x) * scale).ToArray();
    }
}
