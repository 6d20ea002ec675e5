using System.Globalization;
using System.Net;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using System.Xml.Linq;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// Headroom on the demo's samples: every report gives each check the share of its tolerance it uses, the binding
/// checks stand right under the verdict, the console is compact unless asked for every check, the failure sentence
/// is one in the console, JUnit and HTML, and the Python training-loop example of docs/ runs on the demo's data.
/// These compare the program's reports with each other and with the documented definition (docs/result-json.md):
/// upper share = upper bound / tolerance, point share = estimate / tolerance.
/// </summary>
public partial class DemoEndToEndTests
{
    private string Drifted => Path.Combine(demo.Folder, "surrogate-drifted.parquet");

    private string Faithful => Path.Combine(demo.Folder, "surrogate-faithful.parquet");

    [Fact]
    public void The_console_is_compact_by_default_with_the_binding_checks_right_under_the_verdict()
    {
        var (code, stdout, stderr) = Cli.Run("check", "--contract", demo.Contract, "--sample", Drifted);
        Assert.True(code == 1, stdout + stderr);

        var lines = stdout.Split('\n').Select(l => l.TrimEnd('\r')).ToList();
        // No table by default: its heading and its rows are absent, and the option that shows it is named.
        Assert.DoesNotContain(lines, l => l.StartsWith("feature ", StringComparison.Ordinal) && l.Contains("events needed", StringComparison.Ordinal));
        Assert.Contains("--all-checks", stdout);
        var verdict = lines.FindIndex(l => l.StartsWith("FAILED: ", StringComparison.Ordinal));
        Assert.True(verdict >= 0, stdout);
        Assert.StartsWith("Binding checks (5 closest to their tolerance", lines[verdict + 1]);
        for (var i = 2; i <= 6; i++) Assert.Matches(@"^  \S+ \S+: uses \d+% of its tolerance \(estimate -?\d+%\)", lines[verdict + i]);
        // Failures (and undecided checks) as coded messages, failures first.
        var coded = stderr.Split('\n').Where(l => l.Contains(" GATE3", StringComparison.Ordinal)).ToList();
        Assert.NotEmpty(coded);
        var firstUndecided = coded.FindIndex(l => l.Contains("GATE3100", StringComparison.Ordinal));
        Assert.True(firstUndecided < 0 || coded.Skip(firstUndecided).All(l => l.Contains("GATE3100", StringComparison.Ordinal)), stderr);

        var all = Cli.Run("check", "--contract", demo.Contract, "--sample", Drifted, "--all-checks");
        Assert.Equal(1, all.ExitCode);
        var table = all.Stdout.Split('\n').Select(l => l.TrimEnd('\r')).ToList();
        var header = table.FindIndex(l => l.StartsWith("feature ", StringComparison.Ordinal) && l.Contains(" used ", StringComparison.Ordinal));
        Assert.True(header >= 0, all.Stdout);
        // Failures first, then undecided, then passes.
        var verdicts = table.Skip(header + 2).TakeWhile(l => l.Length > 0 && !l.StartsWith("used:", StringComparison.Ordinal))
            .Select(l => Regex.IsMatch(l, @"\sFAIL(\s|$)") ? 0 : Regex.IsMatch(l, @"\sinconclusive(\s|$)") ? 1 : 2).ToList();
        Assert.Equal(verdicts.Order(), verdicts);
        Assert.Contains(0, verdicts);
        Assert.Contains(2, verdicts);
    }

    [Fact]
    public void A_failed_check_is_worded_alike_in_the_console_junit_and_html()
    {
        var junit = Path.Combine(demo.Folder, "sentence.junit.xml");
        var html = Path.Combine(demo.Folder, "sentence.html");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", demo.Contract, "--sample", Drifted, "--junit", junit, "--html", html);
        Assert.True(code == 1, stdout + stderr);

        // The console's coded message: "file(line,col): error GATE3001: <sentence>".
        var console = stderr.Split('\n').Select(l => Regex.Match(l.TrimEnd('\r'), @"error GATE30\d\d: (.*)$")).Where(m => m.Success).Select(m => m.Groups[1].Value).ToList();
        var junitMessages = XDocument.Load(junit).Descendants("failure").Select(f => f.Attribute("message")!.Value)
            .Where(m => !m.Contains("is inconclusive", StringComparison.Ordinal)).ToList();
        var page = WebUtility.HtmlDecode(File.ReadAllText(html));
        var htmlSentences = Regex.Matches(page, "<span class=\"sentence\">(.*?)</span>").Select(m => m.Groups[1].Value).ToList();

        Assert.NotEmpty(console);
        Assert.Equal(console.Order(StringComparer.Ordinal), junitMessages.Order(StringComparer.Ordinal));
        foreach (var sentence in console)
        {
            Assert.Contains(sentence, htmlSentences);
            Assert.Matches(@"; uses (\d+%|>1000%) of its tolerance \(estimate (-?\d+%|>1000%)\)$", sentence);
        }
    }

    [Fact]
    public void Every_report_gives_each_check_its_share_of_the_tolerance_and_lists_the_binding_checks()
    {
        var junit = Path.Combine(demo.Folder, "headroom.junit.xml");
        var html = Path.Combine(demo.Folder, "headroom.html");
        var markdown = Path.Combine(demo.Folder, "headroom.md");
        var json = Path.Combine(demo.Folder, "headroom.json");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", demo.Contract, "--sample", Faithful,
            "--junit", junit, "--html", html, "--markdown", markdown, "--json", json);
        Assert.True(code == 0, stdout + stderr);

        var result = JsonNode.Parse(File.ReadAllText(json))!;
        var checks = result["checks"]!.AsArray();
        var cases = XDocument.Load(junit).Descendants("testcase").Where(t => t.Element("properties") is not null).ToList();
        Assert.Equal(checks.Count, cases.Count);
        foreach (var c in checks)
        {
            var upper = (double)c!["upper"]!;
            var estimate = (double)c["estimate"]!;
            var tolerance = (double)c["tolerance"]!;
            // The documented definition (docs/result-json.md): the bound's and the estimate's share of the tolerance.
            Assert.Equal(upper / tolerance, (double)c["headroom"]!["upper_share"]!, 12);
            Assert.Equal(estimate / tolerance, (double)c["headroom"]!["point_share"]!, 9);
            // JUnit carries the same figures per test case (the program compared with itself).
            var testcase = cases.Single(t => t.Attribute("classname")!.Value.EndsWith("." + (string)c["subject"]!, StringComparison.Ordinal)
                                             && t.Attribute("name")!.Value == (string)c["check"]!);
            var property = testcase.Descendants("property").ToDictionary(p => p.Attribute("name")!.Value, p => p.Attribute("value")!.Value);
            Assert.Equal((double)c["headroom"]!["upper_share"]!, double.Parse(property["headroom_upper_share"], CultureInfo.InvariantCulture));
            Assert.StartsWith("uses ", property["headroom"]);
        }

        // The binding checks: the five largest upper shares of those that did not fail, in that order, in every report.
        var expected = checks.Where(c => (string)c!["verdict"]! != "fail").OrderByDescending(c => (double)c!["headroom"]!["upper_share"]!).Take(5)
            .Select(c => ((string)c!["subject"]!, (string)c["check"]!)).ToList();
        Assert.Equal(expected, result["binding_checks"]!.AsArray().Select(b => ((string)b!["subject"]!, (string)b["check"]!)).ToList());
        var page = File.ReadAllText(html);
        var list = Regex.Match(page, "<div class=\"binding\" id=\"binding-checks\">.*?</div>", RegexOptions.Singleline).Value;
        Assert.Equal(expected.Select(e => e.Item1), Regex.Matches(list, "data-subject=\"([^\"]*)\"").Select(m => WebUtility.HtmlDecode(m.Groups[1].Value)));
        // Right under the verdict: before the run's facts.
        Assert.True(page.IndexOf("id=\"binding-checks\"", StringComparison.Ordinal) < page.IndexOf("<dl class=\"facts\">", StringComparison.Ordinal));
        var md = File.ReadAllText(markdown);
        Assert.Contains("Binding checks (5 closest to their tolerance", md);
        Assert.True(md.IndexOf("Binding checks", StringComparison.Ordinal) < md.IndexOf("passing checks</summary>", StringComparison.Ordinal));
        Assert.Contains("| feature | check | region | estimate | tolerance | used |", md);
        var consoleBinding = stdout.Split('\n').SkipWhile(l => !l.StartsWith("Binding checks", StringComparison.Ordinal)).Skip(1).Take(5).ToList();
        Assert.Equal(expected.Select(e => $"{e.Item1} {e.Item2}"), consoleBinding.Select(l => l.Trim()[..l.Trim().IndexOf(':')]));
    }

    [PythonModulesFact("json", "csv", "subprocess")]
    public void The_python_training_loop_example_logs_the_binding_headroom_per_epoch_on_the_demo()
    {
        var out_ = Path.Combine(demo.Folder, "loop");
        var script = Path.Combine(RepositoryRoot.Path, "docs", "examples", "training-loop.py");
        var gatetasks = $"dotnet {typeof(GateTasks.Cli.CliApp).Assembly.Location}";
        // Four fake epochs: the demo's faithful and drifted samples in turn.
        var (exit, stdout, stderr) = ProcessRunner.Run(ExternalPython.Interpreter,
            [script, "--gatetasks", gatetasks, "--contract", demo.Contract, "--samples", Faithful, Drifted, "--epochs", "4", "--out", out_],
            demo.Folder, null, timeoutSeconds: 600);
        Assert.True(exit == 0, stdout + stderr);
        Assert.Contains("epoch 1: passed (exit 0)", stdout);
        Assert.Contains("epoch 2: failed (exit 1)", stdout);
        Assert.Contains("epoch 3: passed (exit 0)", stdout);
        Assert.Contains("epoch 4: failed (exit 1)", stdout);

        var rows = File.ReadAllLines(Path.Combine(out_, "headroom.csv"));
        Assert.Equal("epoch,outcome,failed,binding_check,binding_share,binding_point_share,worst_share", rows[0]);
        Assert.Equal(5, rows.Length);
        for (var epoch = 1; epoch <= 4; epoch++)
        {
            var cells = rows[epoch].Split(',');
            var result = JsonNode.Parse(File.ReadAllText(Path.Combine(out_, $"epoch-{epoch}.json")))!;
            var binding = result["binding_checks"]![0]!;
            // The CSV holds what the JSON result said (Python's repr of the float read by json.load).
            Assert.Equal($"{(string)binding["subject"]!} {(string)binding["check"]!}", cells[3]);
            Assert.Equal((double)binding["upper_share"]!, double.Parse(cells[4], CultureInfo.InvariantCulture), 12);
            Assert.Equal(result["checks"]!.AsArray().Max(c => (double?)c!["headroom"]!["upper_share"])!.Value, double.Parse(cells[6], CultureInfo.InvariantCulture), 12);
        }
        // The faithful checkpoints keep every non-failed check inside its tolerance; the drifted ones fail checks.
        Assert.True(double.Parse(rows[1].Split(',')[4], CultureInfo.InvariantCulture) < 1);
        Assert.True(double.Parse(rows[2].Split(',')[6], CultureInfo.InvariantCulture) > 1);
        // The plot is optional: drawn with matplotlib when it is installed, else said.
        if (ExternalPython.Has(["matplotlib"])) Assert.True(File.Exists(Path.Combine(out_, "headroom.png")));
        else Assert.Contains("matplotlib is not installed", stdout);
    }
}
