using System.Globalization;
using System.Text.RegularExpressions;
using System.Xml.Linq;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Reports;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Reports;

/// <summary>The HTML report's structure: a section per feature with its plot and tolerance bands, a row per check.</summary>
public sealed class HtmlReportTests(ReportCase run) : IClassFixture<ReportCase>
{
    private static readonly Regex SectionPattern = new(
        "<section class=\"subject [a-z]+\" id=\"(?<id>[^\"]+)\" data-verdict=\"(?<verdict>[a-z]+)\" data-feature=\"(?<name>[^\"]+)\">(?<body>.*?)</section>",
        RegexOptions.Singleline);

    private RunResult Shifted => _shifted ??= run.Run(30_000, 3, 0.3);
    private RunResult? _shifted;

    private static List<(string Name, string Verdict, string Body)> Sections(string html) =>
        SectionPattern.Matches(html).Select(m => (System.Net.WebUtility.HtmlDecode(m.Groups["name"].Value), m.Groups["verdict"].Value, m.Groups["body"].Value)).ToList();

    [Fact]
    public void Every_feature_and_pair_has_a_section_with_a_row_per_check_and_a_plot_where_histograms_exist()
    {
        var report = Shifted;
        var sections = Sections(HtmlReport.Render(report));
        var subjects = report.Outcomes.Select(o => o.Subject.Name).Distinct().ToList();
        Assert.Equal(subjects.OrderBy(s => s), sections.Select(s => s.Name).OrderBy(s => s));
        foreach (var (name, _, body) in sections)
        {
            var labels = Regex.Matches(body, "<tr class=\"[a-z]+\" data-check=\"([^\"]+)\"").Select(m => m.Groups[1].Value).ToList();
            Assert.Equal(report.Outcomes.Where(o => o.Subject.Name == name).Select(o => o.Check.Label).OrderBy(l => l), labels.OrderBy(l => l));
            var plotted = report.Comparisons.Any(c => c.Spec.Name == name);
            Assert.Equal(plotted ? 1 : 0, Regex.Matches(body, "<svg[ >]").Count);
        }
        Assert.Contains(sections, s => s.Name == "x~y" && !s.Body.Contains("<svg"));
    }

    [Fact]
    public void Plots_are_well_formed_svg_with_a_band_per_ratio_tolerance_drawn_to_its_size()
    {
        var html = HtmlReport.Render(Shifted);
        var x = Sections(html).Single(s => s.Name == "x");
        Assert.Contains("data-bands=\"core:0.15 tails:0.3 upper:0.2\"", x.Body);
        var svg = XDocument.Parse(Regex.Match(x.Body, "<svg.*?</svg>", RegexOptions.Singleline).Value);
        List<XElement> Filled(string hex) => svg.Descendants().Where(e => e.Name.LocalName == "rect"
            && ((string?)e.Attribute("style") ?? "").Contains($"fill:{Rgb(hex)};", StringComparison.Ordinal)).ToList();
        var core = Filled(ReportPalette.CoreBand);
        var tails = Filled(ReportPalette.TailsBand);
        var named = Filled(ReportPalette.NamedBand);
        Assert.Single(core);      // the core is one run of bins
        Assert.Equal(2, tails.Count); // the tails lie on both sides of it
        Assert.Single(named);
        // Bands share the ratio axis, so their heights stand as their tolerances: 2·0.15 : 2·0.3 : 2·0.2.
        double Height(XElement e) => double.Parse((string)e.Attribute("height")!, CultureInfo.InvariantCulture);
        Assert.Equal(0.5, Height(core[0]) / Height(tails[0]), 2);
        Assert.Equal(2.0 / 3, Height(named[0]) / Height(tails[0]), 2);
        // The tails bands flank the core band.
        double Left(XElement e) => double.Parse((string)e.Attribute("x")!, CultureInfo.InvariantCulture);
        var sides = tails.Select(Left).OrderBy(v => v).ToList();
        Assert.True(sides[0] < Left(core[0]) && Left(core[0]) < sides[1]);
        // Axis titles name the feature and both panels.
        var texts = svg.Descendants().Where(e => e.Name.LocalName == "text").Select(e => e.Value).ToList();
        Assert.Contains("x", texts);
        Assert.Contains("surrogate / ref.", texts);
        Assert.Contains("density (normalised)", texts);
    }

    [Fact]
    public void Failing_features_come_first_and_the_header_says_what_was_checked()
    {
        var report = Shifted;
        Assert.False(report.NoCheckFailed());
        var html = HtmlReport.Render(report);
        var verdicts = Sections(html).Select(s => s.Verdict).ToList();
        Assert.Equal("fail", verdicts[0]);
        var rank = verdicts.Select(v => v switch { "fail" => 0, "inconclusive" => 1, _ => 2 }).ToList();
        Assert.Equal(rank.OrderBy(r => r), rank);
        Assert.Equal("x", Sections(html)[0].Name);
        Assert.Contains("id=\"overall\">FAILED<", html);
        Assert.Contains(report.ReferenceSha256, html);
        Assert.Contains(System.Net.WebUtility.HtmlEncode(report.SampleFiles[0]), html);
        Assert.Contains(report.Events.ToString(CultureInfo.InvariantCulture), html);
        Assert.Contains($"<b>{report.Failures}</b> failed", html);
    }

    [Fact]
    public void The_page_loads_nothing_from_elsewhere()
    {
        var html = HtmlReport.Render(Shifted);
        Assert.DoesNotContain("<link", html);
        Assert.DoesNotContain(" src=", html);
        Assert.DoesNotContain("url(", Regex.Replace(html, @"url\(#[A-Za-z0-9_-]+\)", "")); // only references within the page
        Assert.DoesNotContain("@import", html);
        // The only addresses are the SVG namespace names, which browsers never fetch.
        var addresses = Regex.Matches(html, "https?://[^\"' )<]+").Select(m => m.Value).Distinct().ToList();
        Assert.All(addresses, a => Assert.Contains(a, new[] { "http://www.w3.org/2000/svg", "http://www.w3.org/1999/xlink" }));
    }

    [Fact]
    public void Written_atomically_to_the_path_given()
    {
        var path = Path.Combine(run.Folder, "out", "report.html");
        HtmlReport.Write(path, Shifted);
        Assert.StartsWith("<!DOCTYPE html>", File.ReadAllText(path));
        Assert.Equal(["report.html"], Directory.GetFiles(Path.GetDirectoryName(path)!).Select(Path.GetFileName));
    }

    private static string Rgb(string hex)
    {
        var v = Convert.ToInt32(hex[1..], 16);
        return $"rgb({(v >> 16) & 255},{(v >> 8) & 255},{v & 255})";
    }
}
