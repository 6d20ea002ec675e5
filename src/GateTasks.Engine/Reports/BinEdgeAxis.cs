using OxyPlot.Axes;

namespace GateTasks.Engine.Reports;

/// <summary>
/// A linear value axis whose minor ticks stand at a histogram's bin edges, so unequal bins are visible (up to
/// <see cref="MostEdges"/>; beyond that, ordinary minor ticks).
/// </summary>
internal sealed class BinEdgeAxis(IReadOnlyList<double> edges) : LinearAxis
{
    /// <summary>More edges than this would blur into a bar.</summary>
    public const int MostEdges = 200;

    /// <inheritdoc />
    public override void GetTickValues(out IList<double> majorLabelValues, out IList<double> majorTickValues, out IList<double> minorTickValues)
    {
        base.GetTickValues(out majorLabelValues, out majorTickValues, out var minor);
        minorTickValues = edges.Count <= MostEdges ? edges.ToList() : minor;
    }
}
