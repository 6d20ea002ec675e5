using System.Globalization;
using System.Net;
using System.Text;
using GateTasks.Engine.Runs;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;
using OxyPlot.Series;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The HTML report's trend panel for one subject: the upper share (upper bound / tolerance) of each of its checks at
/// every ledger entry that recorded results and in this run, drawn with OxyPlot as the feature plots are and exported
/// as inline SVG. Entries run along the horizontal axis, oldest first, with this run last; a dashed line at 1 marks the
/// tolerance's edge, so a check creeping towards it over retrainings shows before it fails. Each check has its own
/// colour and marker; an entry that did not hold a check, or recorded no results, leaves a gap. Shares beyond the
/// axis (an impossible measurement is +∞) are drawn at its top as triangles. Without entries with results the panel is
/// one line saying why.
/// </summary>
internal static class HeadroomTrendPlot
{
    public const double Width = 780;
    public const double Height = 270;

    /// <summary>Most a share the axis shows; larger shares sit at the top, marked.</summary>
    private const double Ceiling = 3;

    // Distinct hues that also read apart in grey, with a marker shape of their own, so lines do not rely on colour alone.
    private static readonly string[] Colours = ["#34506b", "#b4532a", "#2c7a4b", "#7d5ba6", "#a86a00", "#1f7a8c", "#8c2f5d", "#5d6673"];
    private static readonly MarkerType[] Markers = [MarkerType.Circle, MarkerType.Square, MarkerType.Diamond, MarkerType.Triangle];

    /// <summary>The colour of the n-th check's line.</summary>
    public static string Colour(int n) => Colours[n % Colours.Length];

    /// <summary>The panel of one subject as HTML: a figure with the plot and its key, or one line saying why there is none.</summary>
    public static string Html(RunResult report, string subject)
    {
        var ledger = report.LedgerEntries;
        var history = ledger.History;
        if (ledger.Absence is { } absence)
            return Note($"Headroom trend: none to draw, {absence}; accepted entries ('gatetasks accept') record each check's headroom.");
        if (!history.AnyRecorded)
            return Note($"Headroom trend: none to draw, none of the ledger's {ledger.Entries.Count} entr{(ledger.Entries.Count == 1 ? "y" : "ies")} recorded check results.");
        var trend = HeadroomTrend.For(report, history, subject);
        if (trend.Lines.Count == 0) return Note("Headroom trend: no tolerance check to draw.");
        var sb = new StringBuilder();
        sb.Append("<figure class=\"plot trend\" data-trend=\"").Append(E(subject)).Append("\">\n")
          .Append(Svg(trend, "trend-" + IdPart(subject)))
          .Append("\n<figcaption><span class=\"key\"><b>headroom across accepted entries</b>: upper bound / tolerance (1 = tolerance edge)</span>");
        for (var i = 0; i < trend.Lines.Count; i++)
        {
            var line = trend.Lines[i];
            sb.Append("<span class=\"key\" data-check=\"").Append(E(line.Check)).Append("\"><i class=\"sw\" style=\"background:").Append(Colour(i)).Append("\"></i>")
              .Append(E(line.Check));
            if (line.Worsened && line.SinceThen is { } d)
                sb.Append(" <b class=\"fail\">").Append(E($"worse than at entry {line.Then!.Entry.Number} beyond noise: estimate / tolerance {Num(1 - d.PointThen)} → {Num(1 - d.PointNow)}, noise allows {Num(d.Allowed)}")).Append("</b>");
            sb.Append("</span>");
        }
        if (trend.Lines.Any(l => l.UpperShares.Any(v => v > AxisTop(trend))))
            sb.Append("<span class=\"key\">").Append(E($"▲ at the top: a share beyond the axis (over {Num(AxisTop(trend))}, or not measurable)")).Append("</span>");
        var unrecorded = history.Entries.Where(e => !Ledger.HeadroomHistory.RecordedResults(e)).Select(e => "#" + e.Number.ToString(CultureInfo.InvariantCulture)).ToList();
        if (unrecorded.Count > 0) sb.Append("<span class=\"key\">").Append(E($"entries without results: {string.Join(", ", unrecorded)}")).Append("</span>");
        sb.Append("</figcaption>\n</figure>\n");
        return sb.ToString();
    }

    /// <summary>
    /// The plot as an SVG element sized by its viewBox, ready to inline in HTML, its clip-path ids prefixed with
    /// <paramref name="idPrefix"/> (<see cref="SvgFragment"/>).
    /// </summary>
    public static string Svg(HeadroomTrend trend, string idPrefix)
    {
        var svg = SvgFragment.Scoped(new SvgExporter { Width = Width, Height = Height, IsDocument = false }.ExportToString(Build(trend)), idPrefix);
        var start = svg.IndexOf("<svg", StringComparison.Ordinal);
        var end = svg.IndexOf('>', start);
        var tag = System.Text.RegularExpressions.Regex.Replace(svg[start..end], "\\s(width|height)=\"[^\"]*\"", "");
        if (!tag.Contains("viewBox", StringComparison.Ordinal))
            tag += string.Create(CultureInfo.InvariantCulture, $" viewBox=\"0 0 {Width} {Height}\"");
        tag += " role=\"img\" aria-label=\"" + E($"{trend.Subject}: each check's upper bound over its tolerance at each accepted entry and in this run") + "\"";
        return svg[start..].Replace(svg[start..end], tag);
    }

    /// <summary>The top of the share axis: above the tolerance's edge and the largest share, at most <see cref="Ceiling"/>.</summary>
    private static double AxisTop(HeadroomTrend trend) =>
        Math.Min(Ceiling, Math.Max(1.15, 1.08 * trend.Lines.SelectMany(l => l.UpperShares).Where(double.IsFinite).DefaultIfEmpty(1).Max()));

    private static PlotModel Build(HeadroomTrend trend)
    {
        var model = new PlotModel
        {
            DefaultFont = "Arial, 'Liberation Sans', Helvetica, sans-serif",
            DefaultFontSize = 12,
            TextColor = OxyColor.Parse(ReportPalette.Ink),
            PlotAreaBorderThickness = new OxyThickness(0),
            Padding = new OxyThickness(6, 8, 18, 4),
            Background = OxyColor.Parse(ReportPalette.Paper),
        };
        var columns = trend.Columns;
        // A long ledger labels every k-th entry (and this run), so the labels do not run into one another.
        var every = (int)Math.Ceiling(columns.Count / 14.0);
        bool Labelled(int i) => i == columns.Count - 1 || i % every == 0;
        model.Axes.Add(PlotAxisStyle.Styled(new LinearAxis
        {
            Position = AxisPosition.Bottom,
            Title = "accepted entry (oldest first), then this run",
            Minimum = -0.4,
            Maximum = columns.Count - 0.6,
            MajorStep = 1,
            MinorStep = 1,
            Angle = columns.Count > 5 ? 30 : 0,
            AxisTitleDistance = 6,
            LabelFormatter = v => Math.Abs(v - Math.Round(v)) < 1e-9 && Math.Round(v) is var i && i >= 0 && i < columns.Count && Labelled((int)i) ? columns[(int)i] : "",
        }, grid: false));
        var top = AxisTop(trend);
        var bottom = Math.Min(0, 1.08 * trend.Lines.SelectMany(l => l.UpperShares).Where(double.IsFinite).DefaultIfEmpty(0).Min());
        model.Axes.Add(PlotAxisStyle.Styled(new LinearAxis
        {
            Position = AxisPosition.Left,
            Title = "upper bound / tolerance",
            Minimum = bottom,
            Maximum = top,
            StringFormat = "0.##",
            AxisTitleDistance = 14,
            MaximumMajorIntervalCount = 5,
        }, grid: true));
        model.Annotations.Add(new LineAnnotation
        {
            Type = LineAnnotationType.Horizontal,
            Y = 1,
            Color = OxyColor.Parse(ReportPalette.Fail),
            LineStyle = LineStyle.Dash,
            StrokeThickness = 1.2,
            Text = "tolerance",
            TextColor = OxyColor.Parse(ReportPalette.Fail),
            Layer = AnnotationLayer.BelowSeries,
        });
        for (var n = 0; n < trend.Lines.Count; n++)
        {
            var colour = OxyColor.Parse(Colour(n));
            var line = new LineSeries
            {
                Color = colour,
                StrokeThickness = 1.6,
                MarkerType = Markers[n % Markers.Length],
                MarkerSize = 3.6,
                MarkerFill = colour,
                MarkerStroke = colour,
                // A gap where an entry holds no figure for the check: never a line drawn through it.
                BrokenLineStyle = LineStyle.None,
            };
            var beyond = new ScatterSeries { MarkerType = MarkerType.Triangle, MarkerSize = 5, MarkerFill = colour };
            var shares = trend.Lines[n].UpperShares;
            // Checks sit a little apart along each column, so equal shares do not hide one another's markers.
            var dodge = trend.Lines.Count == 1 ? 0 : 0.16 * (n / (trend.Lines.Count - 1.0) - 0.5);
            for (var column = 0; column < shares.Count; column++)
            {
                var x = column + dodge;
                var y = shares[column];
                if (double.IsNaN(y)) { line.Points.Add(DataPoint.Undefined); continue; }
                if (y > top)
                {
                    beyond.Points.Add(new ScatterPoint(x, top - 0.03 * (top - bottom)));
                    line.Points.Add(DataPoint.Undefined);
                    continue;
                }
                line.Points.Add(new DataPoint(x, y));
            }
            model.Series.Add(line);
            model.Series.Add(beyond);
        }
        return model;
    }

    /// <summary>A subject's name as part of an element id: letters and digits kept, the rest '-', and a digest of the name so that ids stay distinct.</summary>
    private static string IdPart(string subject) =>
        new string(subject.Select(ch => char.IsAsciiLetterOrDigit(ch) ? ch : '-').ToArray()) + "-" +
        Convert.ToHexString(System.Security.Cryptography.SHA256.HashData(Encoding.UTF8.GetBytes(subject)))[..8].ToLowerInvariant();

    private static string Note(string text) => "<p class=\"note trend\">" + E(text) + "</p>\n";

    private static string Num(double v) => double.IsFinite(v) ? v.ToString("0.00", CultureInfo.InvariantCulture) : "inf";

    private static string E(string text) => WebUtility.HtmlEncode(text);
}
