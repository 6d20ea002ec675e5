using System.Globalization;
using System.Net;
using System.Text;
using GateTasks.Engine.Runs;
using OxyPlot;
using OxyPlot.Axes;
using OxyPlot.Series;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The 2-D map of a declared pair, drawn with OxyPlot: three panels side by side in one SVG — the reference's and the
/// surrogate's densities on one sequential colour scale, and the pull per cell on a diverging scale centred on zero
/// (<see cref="PairMap.CellPull"/>). Cells with no weight on either side have no pull and show the grey background.
/// </summary>
internal static class PairMapPlot
{
    public const double PanelWidth = 360;
    public const double PanelHeight = 330;
    public const double Width = 3 * PanelWidth;

    /// <summary>Pulls beyond ± this (or the largest pull, if smaller, but at least 3) take the scale's end colours.</summary>
    private const double PullLimit = 5;

    /// <summary>
    /// The three panels as one SVG element (no XML declaration), ready to inline in HTML; <paramref name="ids"/> prefixes
    /// the panels' element ids, so several maps (and the feature plots) can share one page.
    /// </summary>
    public static string Svg(PairMap map, string ids)
    {
        var densities = map.Reference.Cast<double>().Concat(map.Surrogate.Cast<double>()).Where(double.IsFinite).DefaultIfEmpty(0).Max();
        var top = densities > 0 ? densities : 1;
        var largest = map.Pull.Cast<double>().Where(double.IsFinite).Select(Math.Abs).DefaultIfEmpty(0).Max();
        var pullRange = Math.Clamp(Math.Ceiling(largest), 3, PullLimit);
        var panels = new[]
        {
            Panel(map, "reference", map.Reference, OxyPalettes.Viridis(200), 0, top, "density"),
            Panel(map, "surrogate", map.Surrogate, OxyPalettes.Viridis(200), 0, top, "density"),
            Panel(map, "pull (s − r)/σ", map.Pull, OxyPalettes.BlueWhiteRed(201), -pullRange, pullRange, "pull"),
        };
        var sb = new StringBuilder();
        sb.Append(CultureInfo.InvariantCulture, $"<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{Width}\" height=\"{PanelHeight}\" viewBox=\"0 0 {Width} {PanelHeight}\" data-panels=\"3\">");
        for (var p = 0; p < panels.Length; p++)
        {
            var exporter = new SvgExporter { Width = PanelWidth, Height = PanelHeight, IsDocument = false };
            var svg = exporter.ExportToString(panels[p]);
            // Each panel is a nested SVG placed at its offset; the outer one holds them side by side. Each panel's clip
            // paths get a prefix of their own (SvgFragment).
            svg = SvgFragment.Scoped(svg, $"{ids}-{p}");
            sb.Append(svg.Replace("<svg", string.Create(CultureInfo.InvariantCulture,
                $"<svg x=\"{p * PanelWidth}\" y=\"0\" data-panel=\"{(p == 0 ? "reference" : p == 1 ? "surrogate" : "pull")}\""), StringComparison.Ordinal));
        }
        sb.Append("</svg>");
        return sb.ToString();
    }

    /// <summary>A standalone SVG file of the map.</summary>
    public static string Document(PairMap map) => "<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"no\"?>\n" + Svg(map, "map") + "\n";

    /// <summary>
    /// The report's section of pair maps: per declared pair, in contract order, its map with a caption, or a one-line
    /// note when the reference holds no 2-D cells for it. Empty when the contract declares no pair.
    /// </summary>
    public static string Section(RunResult report)
    {
        if (report.Contract.Pairs.Count == 0) return "";
        var sb = new StringBuilder();
        sb.Append("<section class=\"maps\" id=\"pair-maps\">\n<h2>2-D maps of the declared pairs</h2>\n");
        for (var index = 0; index < report.Contract.Pairs.Count; index++)
        {
            var spec = report.Contract.Pairs[index];
            if (PairMap.Of(report, spec) is not { } map)
            {
                sb.Append("<p class=\"note\" data-pair=\"").Append(E(spec.Name)).Append("\" data-map=\"missing\">").Append(E(PairMap.MissingNote(spec))).Append("</p>\n");
                continue;
            }
            sb.Append("<figure class=\"pairmap\" data-pair=\"").Append(E(spec.Name)).Append("\">\n")
              .Append(Responsive(Svg(map, "map" + index.ToString(CultureInfo.InvariantCulture)), $"{spec.Name}: reference and surrogate densities and the pull per cell"))
              .Append("\n<figcaption><b>").Append(E(spec.Name)).Append("</b> ")
              .Append(E($"{map.XEdges.Length - 1} × {map.YEdges.Length - 1} cells{(spec.Chi2 is null ? " (map grid)" : " (the χ² test's cells, merged to the map grid)")}; " +
                        $"outside them: reference {Percent(map.ReferenceOutside)}, surrogate {Percent(map.SurrogateOutside)} of the pair's weight. " +
                        "Densities are each side's share of the pair's weight per unit area, on one colour scale; " +
                        "pull = (s − r)/σ of the shares, σ² = Σw²ₛ/S² + Σw²ᵣ/R²; grey: no events on either side."))
              .Append("</figcaption>\n</figure>\n");
        }
        sb.Append("</section>\n");
        return sb.ToString();
    }

    /// <summary>The rules the maps' section adds to the report's style sheet.</summary>
    public const string Style = """
        section.maps{background:var(--paper);margin:12px 0;padding:4px 16px 8px;border-radius:3px;box-shadow:0 1px 3px #0002}
        section.maps h2{font-size:1.1em;margin:8px 0}
        figure.pairmap{margin:8px 0 14px;max-width:1100px}figure.pairmap svg{width:100%;height:auto;display:block}
        figure.pairmap figcaption{display:block}
        """;

    private static PlotModel Panel(PairMap map, string title, double[,] values, OxyPalette palette, double low, double high, string scale)
    {
        var model = new PlotModel
        {
            Title = title,
            TitleFontSize = 14,
            TitleFontWeight = 600,
            DefaultFont = "Arial, 'Liberation Sans', Helvetica, sans-serif",
            DefaultFontSize = 12,
            TextColor = OxyColor.Parse(ReportPalette.Ink),
            PlotAreaBorderThickness = new OxyThickness(0),
            PlotAreaBackground = OxyColor.Parse(ReportPalette.Grid),
            Padding = new OxyThickness(4, 4, 8, 4),
            Background = OxyColor.Parse(ReportPalette.Paper),
        };
        var (xLow, xHigh) = FeaturePlot.View(map.XEdges, discrete: false);
        var (yLow, yHigh) = FeaturePlot.View(map.YEdges, discrete: false);
        model.Axes.Add(PlotAxisStyle.Styled(new LinearAxis
        {
            Position = AxisPosition.Bottom, Title = map.Spec.First, Minimum = xLow, Maximum = xHigh, StringFormat = "g4", MaximumMajorIntervalCount = 5,
        }, grid: false));
        model.Axes.Add(PlotAxisStyle.Styled(new LinearAxis
        {
            Position = AxisPosition.Left, Title = map.Spec.Second, Minimum = yLow, Maximum = yHigh, StringFormat = "g4", MaximumMajorIntervalCount = 6,
        }, grid: false));
        model.Axes.Add(new LinearColorAxis
        {
            Position = AxisPosition.Right,
            Palette = palette,
            Minimum = low,
            Maximum = high,
            LowColor = palette.Colors[0],
            HighColor = palette.Colors[^1],
            StringFormat = scale == "pull" ? "0.#" : "g3",
            IsZoomEnabled = false,
            IsPanEnabled = false,
            MaximumMajorIntervalCount = 5,
        });
        var series = new RectangleSeries();
        for (var i = 0; i < values.GetLength(0); i++)
            for (var j = 0; j < values.GetLength(1); j++)
                if (double.IsFinite(values[i, j]))
                    series.Items.Add(new RectangleItem(map.XEdges[i], map.XEdges[i + 1], map.YEdges[j], map.YEdges[j + 1], values[i, j]));
        model.Series.Add(series);
        return model;
    }

    /// <summary>Drops the fixed size so the map scales with the page; its viewBox keeps the aspect ratio.</summary>
    private static string Responsive(string svg, string label)
    {
        var end = svg.IndexOf('>');
        var tag = System.Text.RegularExpressions.Regex.Replace(svg[..end], "\\s(width|height)=\"[^\"]*\"", "");
        return tag + " role=\"img\" aria-label=\"" + E(label) + "\"" + svg[end..];
    }

    private static string Percent(double share) => double.IsNaN(share) ? "—" : (100 * share).ToString("0.###", CultureInfo.InvariantCulture) + "%";

    private static string E(string text) => WebUtility.HtmlEncode(text);
}
