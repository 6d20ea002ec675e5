using System.Buffers.Binary;
using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;
using System.Xml.Linq;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ledger;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;
using Xunit.Abstractions;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A ledger of four entries made through the real commands (docs/ledger.md): entry 1 accepted on a faithful sample;
/// entry 2 written through the engine's ledger writer without results (as a ledger from before results were recorded);
/// entry 3 adds x's width-ratio-max and is accepted on a larger sample whose x is shifted by 0.035σ (still within
/// mean-shift-max 0.05); entry 4 drops x's ks-max and is accepted on a faithful sample again.
/// </summary>
public sealed class TrendLedger : IDisposable
{
    public string Folder { get; } = Directory.CreateTempSubdirectory("gatetasks-trends-").FullName;

    public string Contract => Path.Combine(Folder, "precision-contract.yaml");

    public const string FirstContract = """
        contract-version: 1
        title: trend-case
        sample: a.csv
        reference: ref.parquet
        defaults:
          binning: { bins: 10 }
          checks:
            ks-max: 0.03
            mean-shift-max: 0.05
        features:
          - name: x
          - name: y
        """;

    public static readonly string WiderContract = FirstContract.Replace("  - name: x\n", "  - name: x\n    checks:\n      width-ratio-max: 0.05\n");

    public static readonly string LastContract = WiderContract.Replace("      width-ratio-max: 0.05\n", "      width-ratio-max: 0.05\n      ks-max: off\n");

    public TrendLedger()
    {
        Directory.CreateDirectory(Path.Combine(Folder, ".git"));
        Write("fullsim.csv", 40_000, 1, 0);
        Write("a.csv", 20_000, 2, 0);
        Write("b.csv", 200_000, 3, 0.035);
        Write("c.csv", 20_000, 4, 0);
        File.WriteAllText(Contract, FirstContract);
        Run(0, "reference", "build", "--contract", Contract, "--from", Path.Combine(Folder, "fullsim.csv"));
        Run(0, "accept", "--contract", Contract, "--sample", Path.Combine(Folder, "a.csv"), "--reason", "first tolerances", "--by", "Ada");

        // An entry without results, through the engine's ledger writer: the accepted state alone, no margins.
        var loaded = ContractLoader.Load(Contract);
        var existing = LedgerFile.Read(loaded.LedgerFullPath);
        LedgerFile.Append(loaded.LedgerFullPath, existing, existing[0] with
        {
            When = existing[0].When,
            Why = "state re-recorded without results",
            State = AcceptedState.Of(loaded),
        });

        File.WriteAllText(Contract, WiderContract);
        Run(0, "accept", "--contract", Contract, "--sample", Path.Combine(Folder, "b.csv"), "--reason", "x width checked too", "--by", "Ada");
        File.WriteAllText(Contract, LastContract);
        Run(0, "accept", "--contract", Contract, "--sample", Path.Combine(Folder, "c.csv"), "--reason", "x ks-max dropped", "--by", "Ada");
    }

    /// <summary>Writes x ~ N(shift, 1) and y ~ N(0, 1), drawn with MathNet's seeded generator.</summary>
    public string Write(string name, int rows, int seed, double shift)
    {
        var normal = new Normal(0, 1, new Xoshiro256StarStar(seed));
        var csv = new StringBuilder("x,y\n");
        for (var i = 0; i < rows; i++)
            csv.Append(string.Create(CultureInfo.InvariantCulture, $"{normal.Sample() + shift:R},{normal.Sample():R}\n"));
        var path = Path.Combine(Folder, name);
        File.WriteAllText(path, csv.ToString());
        return path;
    }

    /// <summary>One column of a CSV written by <see cref="Write"/>.</summary>
    public double[] Column(string name, int column) =>
        File.ReadLines(Path.Combine(Folder, name)).Skip(1).Select(l => double.Parse(l.Split(',')[column], CultureInfo.InvariantCulture)).ToArray();

    private static void Run(int expected, params string[] args)
    {
        var (code, stdout, stderr) = Cli.Run(args);
        if (code != expected) throw new InvalidOperationException($"gatetasks {string.Join(' ', args)}: exit {code}\n{stdout}{stderr}");
    }

    public void Dispose()
    {
        try { Directory.Delete(Folder, recursive: true); } catch (IOException) { }
    }
}

/// <summary>Headroom across accepted entries: <c>gatetasks history</c>, the HTML report's trend panel and the Markdown summary.</summary>
public sealed class HeadroomTrendTests(TrendLedger ledger, ITestOutputHelper output) : IClassFixture<TrendLedger>
{
    private static string Row(string stdout, string feature, string check)
    {
        var lines = stdout.Split('\n');
        var start = Array.FindIndex(lines, l => l.StartsWith(feature + " ", StringComparison.Ordinal) && l.Contains("#1 "));
        Assert.True(start >= 0, stdout);
        return lines.Skip(start + 1).TakeWhile(l => l.StartsWith("  ", StringComparison.Ordinal)).Single(l => Regex.IsMatch(l, $@"^\s+{Regex.Escape(check)}\s"));
    }

    /// <summary>A history row's cells: "upper / point" with the worse mark, "no results" or "absent".</summary>
    private static List<string> Cells(string row) =>
        Regex.Matches(row, @"(-?\d+\.\d\d) / (-?\d+\.\d\d)( !)?|no results|absent").Select(m => m.Value).ToList();

    [Fact]
    public void History_shows_each_checks_headroom_at_every_entry_with_gaps_said()
    {
        var (code, stdout, stderr) = Cli.Run("history", "--contract", ledger.Contract);
        Assert.True(code == 0, stdout + stderr);
        output.WriteLine(stdout);
        Assert.Contains("4 accepted entries, chain intact", stdout);
        Assert.Contains("Entries that recorded no check results: #2 ('no results').", stdout);

        // Entry 1's point share of x's mean shift, worked here from the events written: |mean(a.x) − mean(fullsim.x)| /
        // sd(fullsim.x) / 0.05, as docs/contract.md defines mean-shift-max (not the program compared with itself).
        var reference = ledger.Column("fullsim.csv", 0);
        var sample = ledger.Column("a.csv", 0);
        var mean = reference.Average();
        var sd = Math.Sqrt(reference.Sum(v => (v - mean) * (v - mean)) / (reference.Length - 1));
        var point = Math.Abs(sample.Average() - mean) / sd / 0.05;
        var shift = Row(stdout, "x", "mean-shift-max");
        var cells = Cells(shift);
        Assert.Equal(4, cells.Count);
        Assert.Equal(point, double.Parse(cells[0].Split(" / ")[1], CultureInfo.InvariantCulture), 0.006);
        Assert.Equal("no results", cells[1]);
        // Entry 3's sample is shifted by 0.035σ at 2·10⁵ events: its point share ≈ 0.7 against ≈ 0.1 at entry 1, a fall
        // of the point margin far beyond z·√(σ₁² + σ₃²) ≈ 1.645·√(0.173² + 0.11²) ≈ 0.34 (σ = √(1/40000 + 1/n) / 0.05,
        // by hand): the ratchet's rule marks it.
        Assert.EndsWith(" !", cells[2]);
        Assert.DoesNotContain("!", cells[3]);

        // x's ks-max was dropped at entry 4, its width-ratio-max added at entry 3.
        Assert.Matches(@"^\s+ks-max\s+\d\.\d\d / -?\d\.\d\d\s+no results\s+\d\.\d\d / -?\d\.\d\d\s+absent$", Row(stdout, "x", "ks-max"));
        Assert.Matches(@"^\s+width-ratio-max\s+absent\s+absent\s+\d\.\d\d / -?\d\.\d\d\s+\d\.\d\d / -?\d\.\d\d$", Row(stdout, "x", "width-ratio-max"));
    }

    [Fact]
    public void History_filters_to_one_feature_and_to_checks_that_got_worse()
    {
        var (code, stdout, stderr) = Cli.Run("history", "--contract", ledger.Contract, "--feature", "y");
        Assert.True(code == 0, stdout + stderr);
        Assert.Contains("mean-shift-max", Row(stdout, "y", "mean-shift-max"));
        Assert.DoesNotContain(stdout.Split('\n'), l => l.StartsWith("x ", StringComparison.Ordinal));

        (code, stdout, stderr) = Cli.Run("history", "--contract", ledger.Contract, "--worsened");
        Assert.True(code == 0, stdout + stderr);
        Assert.EndsWith(" !", Cells(Row(stdout, "x", "mean-shift-max"))[2]);
        // y was drawn from one law throughout (seeds 2, 3 and 4): none of its checks is marked at this seed.
        Assert.DoesNotContain(stdout.Split('\n'), l => l.StartsWith("y ", StringComparison.Ordinal));

        (code, stdout, stderr) = Cli.Run("history", "--contract", ledger.Contract, "--feature", "xx");
        Assert.Equal(2, code); // the documented usage error (docs/error-codes.md)
        Assert.Contains($"error {ErrorCodes.Usage}: --feature xx: no entry of", stderr);
        Assert.Contains("(did you mean 'x'?)", stderr);
        Assert.DoesNotContain("   at ", stderr);
    }

    /// <summary>The check's HTML report, on a sample whose x drifted by 0.2σ (so x's section opens), with its Markdown summary.</summary>
    private (string Html, string Markdown) DriftedReport()
    {
        var folder = Path.Combine(ledger.Folder, "drift-" + Guid.NewGuid().ToString("N")[..6]);
        Directory.CreateDirectory(folder);
        var sample = ledger.Write($"drift-{Path.GetFileName(folder)}.csv", 20_000, 5, 0.2);
        var html = Path.Combine(folder, "report.html");
        var md = Path.Combine(folder, "report.md");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", ledger.Contract, "--sample", sample, "--html", html, "--markdown", md);
        Assert.True(code == 1, stdout + stderr); // x's mean shift of 0.2σ fails its tolerance of 0.05
        return (html, md);
    }

    [Fact]
    public void The_html_report_draws_each_checks_headroom_at_every_recorded_entry_and_this_run()
    {
        var (html, md) = DriftedReport();
        var text = File.ReadAllText(html);
        Assert.Equal(2, Regex.Matches(text, "<figure class=\"plot trend\"").Count); // x and y
        var points = PointsPerCheck(text, "x");
        // Counted from the ledger written above: mean-shift-max at entries 1, 3, 4 and this run; width-ratio-max at 3, 4
        // and this run; ks-max (no longer in the contract) at entries 1 and 3. Entry 2 recorded nothing.
        Assert.Equal(4, points["mean-shift-max"]);
        Assert.Equal(3, points["width-ratio-max"]);
        Assert.Equal(2, points["ks-max"]);
        Assert.Equal(4, PointsPerCheck(text, "y")["ks-max"]);
        Assert.Contains("worse than at entry 4 beyond noise", Figure(text, "x"));
        Assert.Contains("entries without results: #2", Figure(text, "x"));
        // The axis labels name the entries by number and date, then this run.
        Assert.Matches(@">#1 \d{4}-\d\d-\d\d</text>", Figure(text, "x"));
        Assert.Contains(">this run</text>", Figure(text, "x"));

        var summary = File.ReadAllText(md);
        Assert.Contains("- x: headroom worse than at the latest accepted entry, beyond noise, in ", summary);
        Assert.DoesNotContain("- y: headroom worse", summary);
    }

    [Fact]
    public void Without_a_ledger_or_without_recorded_results_the_panel_says_so_in_one_line()
    {
        var folder = Directory.CreateTempSubdirectory("gatetasks-trends-none-").FullName;
        try
        {
            Directory.CreateDirectory(Path.Combine(folder, ".git"));
            var contract = Path.Combine(folder, "precision-contract.yaml");
            File.WriteAllText(contract, TrendLedger.FirstContract);
            File.Copy(Path.Combine(ledger.Folder, "fullsim.csv"), Path.Combine(folder, "fullsim.csv"));
            File.Copy(Path.Combine(ledger.Folder, "a.csv"), Path.Combine(folder, "a.csv"));
            Assert.Equal(0, Cli.Run("reference", "build", "--contract", contract, "--from", Path.Combine(folder, "fullsim.csv")).ExitCode);
            var html = Path.Combine(folder, "r.html");
            var (code, stdout, stderr) = Cli.Run("check", "--contract", contract, "--html", html);
            Assert.True(code == 0, stdout + stderr);
            var text = File.ReadAllText(html);
            Assert.Equal(2, Regex.Matches(text, "<p class=\"note trend\">Headroom trend: none to draw, no acceptance ledger at ").Count);
            Assert.DoesNotContain("<figure class=\"plot trend\"", text);

            // A ledger whose only entry recorded no results.
            var loaded = ContractLoader.Load(contract);
            LedgerFile.Append(loaded.LedgerFullPath, [], new LedgerEntry(0, DateTimeOffset.UtcNow, "Ada", "no results", "c", "c", "r", "r", "s", "n", AcceptedState.Of(loaded), "", ""));
            (code, stdout, stderr) = Cli.Run("check", "--contract", contract, "--html", html);
            text = File.ReadAllText(html);
            Assert.Equal(2, Regex.Matches(text, "<p class=\"note trend\">Headroom trend: none to draw, none of the ledger&#39;s 1 entry recorded check results").Count);
        }
        finally
        {
            Directory.Delete(folder, recursive: true);
        }
    }

    /// <summary>
    /// Debian's chromium renders the drifted report headless with its trend panels and without script errors; the
    /// screenshot is kept in a temporary folder and its path printed.
    /// </summary>
    [ChromiumFact]
    public void A_headless_browser_renders_the_trend_panel()
    {
        var (html, _) = DriftedReport();
        var (exit, dom, stderr) = HeadlessChromium.Run(html, "--dump-dom");
        Assert.True(exit == 0, stderr);
        Assert.Empty(HeadlessChromium.ScriptErrors(stderr));
        Assert.Contains("<figure class=\"plot trend\" data-trend=\"x\">", dom);

        var png = Path.Combine(Directory.CreateTempSubdirectory("gatetasks-trend-shot-").FullName, "trend-report.png");
        var (shotExit, _, shotErr) = HeadlessChromium.Run(html, $"--screenshot={png}", "--window-size=1280,1700", "--hide-scrollbars");
        Assert.True(shotExit == 0, shotErr);
        output.WriteLine($"screenshot of the report with its trend panel: {png}");
        var bytes = File.ReadAllBytes(png);
        // PNG (ISO/IEC 15948): 8-byte signature, then the IHDR chunk with width and height as big-endian integers.
        Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A }, bytes[..8]);
        Assert.Equal(1280, BinaryPrimitives.ReadInt32BigEndian(bytes.AsSpan(16)));
        Assert.True(bytes.Length > 60_000, $"screenshot of {bytes.Length} bytes looks empty");
    }

    private static string Figure(string html, string subject)
    {
        var start = html.IndexOf($"<figure class=\"plot trend\" data-trend=\"{subject}\">", StringComparison.Ordinal);
        Assert.True(start >= 0, $"no trend panel for {subject}");
        return html[start..(html.IndexOf("</figure>", start, StringComparison.Ordinal) + "</figure>".Length)];
    }

    /// <summary>
    /// The markers drawn per check in a subject's trend panel, read from the SVG with System.Xml.Linq: every filled
    /// shape (not the lines) in the colour the panel's key gives the check.
    /// </summary>
    private static Dictionary<string, int> PointsPerCheck(string html, string subject)
    {
        var figure = Figure(html, subject);
        var svg = figure[figure.IndexOf("<svg", StringComparison.Ordinal)..(figure.IndexOf("</svg>", StringComparison.Ordinal) + "</svg>".Length)];
        var shapes = XElement.Parse(svg).Descendants().Where(e => e.Name.LocalName is "ellipse" or "polygon" or "rect" or "path").ToList();
        var fills = shapes.Select(e => Regex.Match((string?)e.Attribute("style") ?? "", @"fill:rgb\((\d+),(\d+),(\d+)\)")).Where(m => m.Success)
            .Select(m => $"#{int.Parse(m.Groups[1].Value):x2}{int.Parse(m.Groups[2].Value):x2}{int.Parse(m.Groups[3].Value):x2}").ToList();
        var counts = new Dictionary<string, int>();
        foreach (Match key in Regex.Matches(figure, "<span class=\"key\" data-check=\"([^\"]+)\"><i class=\"sw\" style=\"background:(#[0-9a-f]{6})\">"))
            counts[key.Groups[1].Value] = fills.Count(f => f == key.Groups[2].Value);
        return counts;
    }
}
