using System.Globalization;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// χ² homogeneity test of the two histograms, flows included, after <see cref="CellMerger"/> (Gagunashvili
/// 2006/2010): the unweighted, weighted or mixed form is chosen by whether each histogram holds plain counts. A
/// goodness-of-fit test: its p-value joins the contract's family; it has no tolerance.
/// </summary>
internal static class ChiSquareCheck
{
    public static Measurement Evaluate(FeatureComparison c) => Evaluate(Cells.Of(c.Reference.Histogram), Cells.Of(c.Surrogate));

    /// <summary>The test on any two sets of cells in the same layout (a 1-D histogram, or a 2-D one flattened row by row).</summary>
    public static Measurement Evaluate(CellContents reference, CellContents sample)
    {
        var (r, s, merged) = CellMerger.MergeSparse(reference, sample);
        var rw = FeatureComparison.IsUnweighted(r);
        var sw = FeatureComparison.IsUnweighted(s);
        var (form, result) = (rw, sw) switch
        {
            (true, true) => ("unweighted", ChiSquareHomogeneity.Unweighted(r.SumW, s.SumW)),
            (true, false) => ("unweighted-weighted", ChiSquareHomogeneity.UnweightedWeighted(r.SumW, s.SumW, s.SumW2)),
            (false, true) => ("unweighted-weighted", ChiSquareHomogeneity.UnweightedWeighted(s.SumW, r.SumW, r.SumW2)),
            _ => ("weighted", ChiSquareHomogeneity.Weighted(r.SumW, r.SumW2, s.SumW, s.SumW2)),
        };
        return new Measurement(result.ChiSquare, double.NaN, double.NaN, result.PValue,
            $"χ² {InvariantNumber.Short(result.ChiSquare)} for {result.DegreesOfFreedom} degrees of freedom, p-value {InvariantNumber.Short(result.PValue)}",
            [new("chi2", InvariantNumber.Exact(result.ChiSquare)), new("ndf", result.DegreesOfFreedom.ToString(CultureInfo.InvariantCulture)),
             new("form", form), new("cells_merged", merged.ToString(CultureInfo.InvariantCulture))]);
    }
}
