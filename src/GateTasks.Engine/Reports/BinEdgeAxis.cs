using OxyPlot.Axes;

namespace GateTasks.Engine.Reports;

/// <summary>A linear value axis whose minor ticks stand at a histogram's bin edges, so unequal bins are visible.</summary>
internal sealed class BinEdgeAxis(IReadOnlyList<double> edges) : LinearAxis
{
    /// <inheritdoc />
    public override void GetTickValues(out IList<double> majorLabelValues, out IList<double> majorTickValues, out IList<double> minorTickValues)
    {
        base.GetTickValues(out majorLabelValues, out majorTickValues, out _);
        minorTickValues = edges.ToList();
    }
}
