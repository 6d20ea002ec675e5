using GateTasks.Engine.Reports;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;
using OxyPlot.Series;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// The global score of each candidate with its ±1 standard-error bar, drawn with OxyPlot (as the check report's
/// feature plots are) and exported as SVG: candidates along the horizontal axis in the order they were given
/// (checkpoints in training order), one marker per candidate with a score, the score on a linear vertical axis
/// with a line at zero. A candidate without a score is a gap labelled "no score", never a point at zero.
/// </summary>
internal static class ScorePlot
{
    private const double Height = 340;

    /// <summary>The plot as an SVG document (with its XML declaration): the Markdown summary's file beside it.</summary>
    public static string SvgDocument(RankingReport report) => Export(report, document: true);

    /// <summary>The plot as an SVG element (no XML declaration), ready to inline in HTML.</summary>
    public static string SvgElement(RankingReport report)
    {
        // OxyPlot writes an XML declaration even for an element; HTML has no use for it.
        var svg = Export(report, document: false);
        var start = svg.IndexOf("<svg", StringComparison.Ordinal);
        return svg[start..].Insert(4, " role=\"img\" aria-label=\"global score ± standard error per candidate, in the order given\"");
    }

    private static string Export(RankingReport report, bool document)
    {
        var candidates = report.Candidates.OrderBy(c => c.Given).ToList();
        var width = Math.Clamp(140 + 70 * candidates.Count, 480, 1200);
        var exporter = new SvgExporter { Width = width, Height = Height, IsDocument = document };
        return exporter.ExportToString(Build(candidates));
    }

    private static PlotModel Build(IReadOnlyList<RankedCandidate> candidates)
    {
        var model = new PlotModel
        {
            DefaultFont = "Arial, 'Liberation Sans', Helvetica, sans-serif",
            DefaultFontSize = 12,
            TextColor = Color(ReportPalette.Ink),
            PlotAreaBorderThickness = new OxyThickness(0),
            Padding = new OxyThickness(6, 8, 14, 4),
            Background = Color(ReportPalette.Paper),
        };
        var labels = candidates.Select(c => Label(c.Result.Candidate)).ToList();
        model.Axes.Add(PlotAxisStyle.Styled(new LinearAxis
        {
            Position = AxisPosition.Bottom,
            Title = "candidate, in the order given",
            Minimum = -0.5,
            Maximum = candidates.Count - 0.5,
            MajorStep = 1,
            MinorStep = 1,
            Angle = candidates.Count > 4 ? 30 : 0,
            LabelFormatter = v => Math.Abs(v - Math.Round(v)) < 1e-9 && Math.Round(v) is var i && i >= 0 && i < labels.Count ? labels[(int)i] : "",
        }, grid: false));
        model.Axes.Add(PlotAxisStyle.Styled(new LinearAxis
        {
            Position = AxisPosition.Left,
            Title = "global score ± SE (lower is closer)",
            StringFormat = "g3",
            MinimumPadding = 0.1,
            MaximumPadding = 0.1,
        }, grid: true));
        model.Annotations.Add(new LineAnnotation { Type = LineAnnotationType.Horizontal, Y = 0, Color = Color(ReportPalette.Muted), LineStyle = LineStyle.Dash });

        var series = new ScatterErrorSeries
        {
            MarkerType = MarkerType.Circle,
            MarkerSize = 4,
            MarkerFill = Color(ReportPalette.Reference),
            ErrorBarColor = Color(ReportPalette.Reference),
            ErrorBarStrokeThickness = 1.5,
            ErrorBarStopWidth = 4,
        };
        for (var i = 0; i < candidates.Count; i++)
        {
            if (candidates[i].Result.Score is { HasValue: true } s)
                series.Points.Add(new ScatterErrorPoint(i, s.Value, 0, s.StandardError));
            else
                model.Annotations.Add(new TextAnnotation
                {
                    Text = "no score",
                    TextPosition = new DataPoint(i, 0),
                    TextColor = Color(ReportPalette.Muted),
                    Stroke = OxyColors.Transparent,
                    TextVerticalAlignment = VerticalAlignment.Bottom,
                });
        }
        model.Series.Add(series);
        // The vertical axis always shows zero, and stays readable when no candidate has a score.
        model.Series.Add(new LineSeries { Color = OxyColors.Transparent, Points = { new DataPoint(0, 0) } });
        return model;
    }

    /// <summary>A candidate's label on the axis: its file or folder name.</summary>
    private static string Label(string candidate) =>
        Path.GetFileName(candidate.TrimEnd('/', '\\')) is { Length: > 0 } name ? name : candidate;

    private static OxyColor Color(string hex) => OxyColor.Parse(hex);
}
