using System.Buffers.Binary;
using System.Text.RegularExpressions;

namespace GateTasks.Cli.Tests;

/// <summary>The demo's HTML reports and Markdown summaries, read by a browser and a Markdown parser.</summary>
public partial class DemoEndToEndTests
{
    private string Reports => Path.Combine(demo.Folder, "reports");

    [Fact]
    public void Demo_writes_html_and_markdown_reports_next_to_the_junit_reports()
    {
        Assert.True(demo.ExitCode == 0, demo.Stdout + demo.Stderr);
        foreach (var (name, verdict) in new[] { ("faithful", "PASSED"), ("drifted", "FAILED") })
        {
            var html = File.ReadAllText(Path.Combine(Reports, name + ".html"));
            Assert.Contains($"id=\"overall\">{verdict}<", html);
            // 16 features (the category shares among them) have histograms to plot; the 4 pairs a 2-D map each (one SVG of
            // three nested panels); the joint test has none. Besides, each of the 20 subjects has a headroom trend panel:
            // the demo's ledger holds an entry with results.
            Assert.Equal(16 + 4 * 4 + 20, Regex.Matches(html, "<svg[ >]").Count);
            Assert.Equal(20, Regex.Matches(html, "<figure class=\"plot trend\"").Count);
            // Every id in the page is unique (HTML Living Standard, 3.2.6 "The id attribute": unique in the element's
            // tree), clip paths included: a url(#id) resolves to the first element of that id, and the plots all come
            // from one exporter that numbers its clip paths from 1. And no XML declaration inside the page.
            var ids = Regex.Matches(html, " id=\"([^\"]+)\"").Select(m => m.Groups[1].Value).ToList();
            Assert.Empty(ids.GroupBy(i => i).Where(g => g.Count() > 1).Select(g => g.Key));
            Assert.Contains(ids, i => i.Contains("clipPath", StringComparison.Ordinal));
            Assert.DoesNotContain("<?xml", html);
            Assert.True(new FileInfo(Path.Combine(Reports, name + ".html")).Length < 3_000_000, "the HTML report should stay a few MB at most");
            Assert.StartsWith($"### GateTasks check {verdict}: demo-diphoton", File.ReadAllText(Path.Combine(Reports, name + ".md")));
            Assert.Contains($"HTML report: {Path.Combine(Reports, name + ".html")}", demo.Stdout);
        }
        Assert.Contains("| `m_gg` | ratio-max | core |", File.ReadAllText(Path.Combine(Reports, "drifted.md")));
    }

    [Fact]
    public void Check_writes_the_html_report_and_markdown_summary_it_is_asked_for()
    {
        var html = Path.Combine(demo.Folder, "asked", "drifted.html");
        var md = Path.Combine(demo.Folder, "asked", "drifted.md");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", demo.Contract,
            "--sample", Path.Combine(demo.Folder, "surrogate-drifted.parquet"), "--html", html, "--markdown", md);
        Assert.True(code == 1, stdout + stderr);
        Assert.Contains($"HTML report: {html}", stdout);
        Assert.Contains($"Markdown summary: {md}", stdout);
        Assert.Contains("data-feature=\"m_gg\"", File.ReadAllText(html));
        Assert.Contains("**FAIL**", File.ReadAllText(md));
        // Nothing but the two reports: no temporary files left behind.
        Assert.Equal(["drifted.html", "drifted.md"], Directory.GetFiles(Path.GetDirectoryName(html)!).Select(Path.GetFileName).OrderBy(n => n));
    }

    [Fact]
    public void A_report_path_that_cannot_be_written_is_an_input_error_not_a_crash()
    {
        // A folder path through a regular file cannot be created.
        var html = Path.Combine(demo.Contract, "report.html");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", demo.Contract, "--html", html);
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains($"error {GateTasks.Engine.Diagnostics.ErrorCodes.OutputNotWritable}: Cannot write {html}", stderr);
        Assert.DoesNotContain("   at ", stderr);
    }

    /// <summary>
    /// Python-Markdown 3.4 (Debian's python3-markdown) with its 'tables' extension, an independent parser of the
    /// table syntax GitHub uses, turns the drifted summary into an HTML table whose rows name the failed checks.
    /// </summary>
    [PythonModulesFact("markdown")]
    public void An_independent_markdown_parser_renders_the_failing_checks_as_a_table()
    {
        const string script = """
            import re, sys
            import xml.etree.ElementTree as ET
            import markdown
            html = markdown.markdown(open(sys.argv[1], encoding='utf-8').read(), extensions=['tables'])
            table = re.search(r'<table>.*?</table>', html, re.S)
            if table is None:
                sys.exit('no table in: ' + html[:400])
            for row in ET.fromstring(table.group(0)).iter('tr'):
                print('\t'.join(''.join(cell.itertext()).strip() + ('*' if cell.find('strong') is not None else '') for cell in row))
            """;
        var (exit, stdout, stderr) = ExternalPython.Run(script, [Path.Combine(Reports, "drifted.md")]);
        Assert.True(exit == 0, stderr);
        var rows = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(r => r.Split('\t')).ToList();
        // "used": each check's share of its tolerance (upper bound's, the estimate's in brackets).
        Assert.Equal(["feature", "check", "region", "estimate", "tolerance", "used", "verdict"], rows[0]);
        Assert.All(rows, r => Assert.Equal(7, r.Length));
        // 10 failed and 5 inconclusive checks (as the drifted demo's JUnit report and build-step test count them).
        // delta_phi's wasserstein-max, inconclusive at W1/σ 0.0197 on the coarse bins, reads 0.0143 on the reference's
        // fine grid and passes its tolerance of 0.02.
        Assert.Equal(15, rows.Count - 1);
        Assert.Contains(rows, r => r[0] == "m_gg" && r[1] == "ratio-max" && r[2] == "core" && r[4] == "≤ 0.03" && r[5] == ">1000% (>1000%)" && r[6] == "FAIL*");
        // The demo's contract holds tolerance checks only: no goodness-of-fit test stands among the verdicts.
        Assert.DoesNotContain(rows, r => r[1].EndsWith("-test", StringComparison.Ordinal));
        Assert.Contains(rows, r => r[0] == "et_ratio" && r[2] == "core" && r[6].StartsWith("inconclusive", StringComparison.Ordinal));
    }

    /// <summary>
    /// Debian's chromium loads the drifted HTML report headless: the page's own script marks the document once it
    /// ran over every section, no script error reaches the console, and a screenshot of the page is drawn.
    /// </summary>
    [ChromiumFact]
    public void A_headless_browser_renders_the_drifted_report_and_its_script_runs_without_error()
    {
        var page = Path.Combine(Reports, "drifted.html");
        var sections = Regex.Matches(File.ReadAllText(page), "<section class=\"subject ").Count;
        // 16 plotted features, and 4 subjects without a plot: the correlated pairs.
        Assert.Equal(20, sections);

        var (exit, dom, stderr) = HeadlessChromium.Run(page, "--dump-dom");
        Assert.True(exit == 0, stderr);
        Assert.Empty(HeadlessChromium.ScriptErrors(stderr));
        var root = Regex.Match(dom, "<html[^>]*>").Value;
        Assert.Contains($"data-report-ready=\"{sections}\"", root);
        Assert.DoesNotContain("data-script-error", root);
        Assert.Contains("<div class=\"controls\" id=\"controls\">", dom); // the script revealed the filter buttons
        // 16 feature plots, 4 pair maps of one SVG holding three panels each, and 20 headroom trend panels.
        Assert.Equal(16, Regex.Matches(dom, "<figure class=\"plot\"").Count);
        Assert.Equal(4, Regex.Matches(dom, "<figure class=\"pairmap\"").Count);
        Assert.Equal(16 + 4 * 4 + 20, Regex.Matches(dom, "<svg[ >]").Count);
        Assert.Matches("<section class=\"subject fail\" id=\"f-m_gg\"", dom);

        var png = Path.Combine(demo.Folder, "drifted.png");
        var (shotExit, _, shotErr) = HeadlessChromium.Run(page, $"--screenshot={png}", "--window-size=1280,1800", "--hide-scrollbars");
        Assert.True(shotExit == 0, shotErr);
        var bytes = File.ReadAllBytes(png);
        // PNG (ISO/IEC 15948): 8-byte signature, then the IHDR chunk with width and height as big-endian integers.
        Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, bytes[..8]);
        Assert.Equal(1280, BinaryPrimitives.ReadInt32BigEndian(bytes.AsSpan(16)));
        Assert.Equal(1800, BinaryPrimitives.ReadInt32BigEndian(bytes.AsSpan(20)));
        // A blank or unstyled page compresses to a few kB; the header, overview and first plots do not.
        Assert.True(bytes.Length > 60_000, $"screenshot of {bytes.Length} bytes looks empty");
    }

    /// <summary>The console check above can fail: a page whose script throws is caught by it.</summary>
    [ChromiumFact]
    public void The_browser_check_catches_a_script_error()
    {
        var page = Path.Combine(demo.Folder, "broken.html");
        File.WriteAllText(page, "<!DOCTYPE html><html><body><p>x</p><script>undefinedFunction();</script></body></html>");
        var (exit, _, stderr) = HeadlessChromium.Run(page, "--dump-dom");
        Assert.Equal(0, exit);
        Assert.Contains(HeadlessChromium.ScriptErrors(stderr), l => l.Contains("undefinedFunction", StringComparison.Ordinal));
    }
}
