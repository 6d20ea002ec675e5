using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Everything the checks of one feature compare: the reference, the surrogate's histogram with the same binning, the
/// core mask, and the surrogate's tallies (spike, far tails, the reference's fine grid).
/// </summary>
internal sealed record FeatureComparison(
    FeatureSpec Spec,
    ReferenceFeature Reference,
    Histogram Surrogate,
    FeatureSummary SurrogateSummary,
    IReadOnlyList<bool> CoreBins,
    SpikeTally? SampleSpike = null,
    FarTailCounts? SampleFarTail = null,
    FineGridCells? SampleFineGrid = null)
{
    /// <summary>True when every cell's Σw² equals its Σw, i.e. all weights are one and the counts are plain counts.</summary>
    public static bool IsUnweighted(CellContents cells)
    {
        for (var c = 0; c < cells.SumW.Length; c++)
            if (Math.Abs(cells.SumW2[c] - cells.SumW[c]) > 1e-9 * Math.Max(1, Math.Abs(cells.SumW[c]))) return false;
        return true;
    }
}
