using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// χ² homogeneity test of the two histograms, flows included (Gagunashvili 2006/2010): the unweighted,
/// weighted or mixed form is chosen by whether each histogram holds plain counts. The p-value must reach the floor.
/// </summary>
internal static class ChiSquareCheck
{
    public static CheckOutcome Evaluate(FeatureComparison c, Contracts.CheckSpec spec)
    {
        var r = c.Reference.Histogram;
        var s = c.Surrogate;
        var rw = FeatureComparison.IsUnweighted(r);
        var sw = FeatureComparison.IsUnweighted(s);
        var (form, result) = (rw, sw) switch
        {
            (true, true) => ("unweighted", ChiSquareHomogeneity.Unweighted(r.Storage.SumW, s.Storage.SumW)),
            (true, false) => ("unweighted-weighted", ChiSquareHomogeneity.UnweightedWeighted(r.Storage.SumW, s.Storage.SumW, s.Storage.SumW2)),
            (false, true) => ("unweighted-weighted", ChiSquareHomogeneity.UnweightedWeighted(s.Storage.SumW, r.Storage.SumW, r.Storage.SumW2)),
            _ => ("weighted", ChiSquareHomogeneity.Weighted(r.Storage.SumW, r.Storage.SumW2, s.Storage.SumW, s.Storage.SumW2)),
        };
        var p = result.PValue;
        return CheckOutcome.Decide(c.Spec, spec, p,
            $"χ² p-value {InvariantNumber.Short(p)} {(p >= spec.Limit ? "≥" : "<")} {InvariantNumber.Short(spec.Limit)} (χ² {InvariantNumber.Short(result.ChiSquare)}, ndf {result.DegreesOfFreedom})",
            [new("chi2", InvariantNumber.Exact(result.ChiSquare)), new("ndf", result.DegreesOfFreedom.ToString(System.Globalization.CultureInfo.InvariantCulture)), new("form", form)]);
    }
}
