namespace GateTasks.Engine.Checks;

/// <summary>
/// Cell contents as counts for tests whose formulas assume unit weights: plain counts stay as they are; weighted
/// cells are scaled by (Σw)/Σw² of the histogram, which keeps Kish's (1965) effective size (an approximation).
/// </summary>
internal static class EffectiveCounts
{
    public static double[] Of(CellContents cells)
    {
        if (FeatureComparison.IsUnweighted(cells)) return cells.SumW;
        var w = cells.SumW.Sum();
        var w2 = cells.SumW2.Sum();
        var scale = w2 > 0 ? w / w2 : 1;
        return cells.SumW.Select(x => Math.Max(0, x) * scale).ToArray();
    }
}
