using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Checks;

/// <summary>Copies of a histogram's cells (flows included), for computations that perturb them.</summary>
internal static class Cells
{
    public static CellContents Of(Histogram h) => new(h.SumW.ToArray(), h.SumW2.ToArray());
}
