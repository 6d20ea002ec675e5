using OxyPlot;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The look every axis of the reports' plots shares: muted solid axis lines, ticks outside, no zoom or pan (a static
/// SVG cannot zoom), and optionally the major grid.
/// </summary>
internal static class PlotAxisStyle
{
    /// <summary>Styles <paramref name="axis"/> and returns it, so a plot can add it in one expression.</summary>
    public static T Styled<T>(T axis, bool grid) where T : OxyPlot.Axes.Axis
    {
        axis.AxislineStyle = LineStyle.Solid;
        axis.AxislineColor = OxyColor.Parse(ReportPalette.Muted);
        axis.TicklineColor = OxyColor.Parse(ReportPalette.Muted);
        axis.TickStyle = OxyPlot.Axes.TickStyle.Outside;
        axis.IsZoomEnabled = false;
        axis.IsPanEnabled = false;
        if (grid)
        {
            axis.MajorGridlineStyle = LineStyle.Solid;
            axis.MajorGridlineColor = OxyColor.Parse(ReportPalette.Grid);
        }
        return axis;
    }
}
