using System.Text.RegularExpressions;
using System.Xml.Linq;
using GateTasks.Engine.Reports;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Reports;

/// <summary>
/// The HTML report's 2-D maps of the declared pairs: a figure of three panels per pair, and a one-line note in its
/// place when the reference holds no 2-D cells for the pair (docs/reports.md). Compares the report with its own run.
/// </summary>
public sealed class PairMapHtmlTests(ReportCase run) : IClassFixture<ReportCase>
{
    private RunResult Shifted => _shifted ??= run.Run(30_000, 3, 0.3);
    private RunResult? _shifted;

    [Fact]
    public void A_pair_with_only_a_correlation_check_gets_a_map_of_reference_surrogate_and_pull()
    {
        var html = HtmlReport.Render(Shifted);
        var figure = Regex.Match(html, "<figure class=\"pairmap\" data-pair=\"x~y\">(?<body>.*?)</figure>", RegexOptions.Singleline);
        Assert.True(figure.Success, "no map of x~y in the report");
        var svg = XDocument.Parse(Regex.Match(figure.Groups["body"].Value, "<svg xmlns.*</svg>", RegexOptions.Singleline).Value);
        var panels = svg.Root!.Elements().Where(e => e.Name.LocalName == "svg").Select(e => (string?)e.Attribute("data-panel")).ToList();
        Assert.Equal(["reference", "surrogate", "pull"], panels);
        // Each panel draws its cells: 12 bins per feature (the contract's binning) is within the map grid, so 12 × 12.
        foreach (var panel in svg.Root.Elements())
            Assert.True(panel.Descendants().Count(e => e.Name.LocalName == "polygon" || e.Name.LocalName == "rect") >= 12 * 12,
                $"panel {(string?)panel.Attribute("data-panel")} draws too few cells");
    }

    [Fact]
    public void A_reference_without_the_pairs_cells_gets_a_one_line_note_in_place_of_the_map()
    {
        var report = Shifted;
        var older = report with
        {
            Reference = report.Reference with
            {
                Correlations = report.Reference.Correlations!.Select(c => c with { Cells2DSumW = null, Cells2DSumW2 = null }).ToList(),
            },
        };
        var html = HtmlReport.Render(older);
        Assert.DoesNotContain("<figure class=\"pairmap\"", html);
        var note = Regex.Match(html, "<p class=\"note\" data-pair=\"x~y\" data-map=\"missing\">(?<text>[^<]*)</p>");
        Assert.True(note.Success, "no note in place of the map");
        Assert.Contains("the reference holds no 2-D cells for this pair", System.Net.WebUtility.HtmlDecode(note.Groups["text"].Value));
        Assert.Contains("gatetasks reference build", System.Net.WebUtility.HtmlDecode(note.Groups["text"].Value));
    }
}
