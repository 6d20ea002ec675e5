using System.Globalization;
using System.Text;
using System.Text.Json;
using System.Xml.Linq;

namespace GateTasks.Cli.Tests;

/// <summary>
/// Goodness-of-fit tests are diagnostics beside the verdict, not members of the fail family (docs/contract.md,
/// docs/reports.md): a test reads "distinguishable at this size" or "not distinguishable at this size", never PASS or
/// FAIL; it changes neither the outcome nor the exit code; and a feature covered only by tests is not shown within any
/// tolerance, so the run is UNDECIDED (exit 5, GATE3021), never PASSED. The expectations are the documented behaviour;
/// the record stream is read with System.Text.Json and the JUnit report with System.Xml.Linq, parsers independent of
/// the engine's own writers. Through the real gatetasks program, in a process of its own; the events are drawn here
/// (Box–Muller on System.Random), not by the program.
/// </summary>
public sealed class GoodnessOfFitDiagnosticsTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-gof-").FullName;

    public GoodnessOfFitDiagnosticsTests() => Directory.CreateDirectory(Path.Combine(_dir, ".git"));

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private const string TestsOnly = """
        contract-version: 1
        sample: sample.csv
        reference: reference.parquet
        decision:
          inconclusive: warn
        features:
          - name: x
            binning: { bins: 20, spacing: uniform, range: [-4, 4] }
            checks:
              chi2-test: on
              ks-test: on
              ad-test: on
              cvm-test: on
        """;

    [Fact]
    public void A_contract_of_tests_alone_does_not_pass_100_events_shifted_by_a_third_of_a_sigma()
    {
        // The case of issue 17: with tests alone, 100 events shifted by 0.3σ read "not significant", which was PASSED.
        Write("reference.csv", Normal(20261210, 0, 20_000));
        Write("sample.csv", Normal(20261211, 0.3, 100));
        File.WriteAllText(Path.Combine(_dir, "contract.yaml"), TestsOnly);
        var (exit, stdout, stderr, records) = Check();

        Assert.True(exit == 5, $"exit {exit}\n{stdout}\n{stderr}"); // docs/cli.md: 5 undecided, never 0
        Assert.DoesNotContain("PASSED", stdout);
        var summary = stdout.Split('\n').Single(l => l.StartsWith("UNDECIDED: ", StringComparison.Ordinal));
        Assert.Contains("0 of 0 checks within tolerance", summary);
        Assert.Contains("goodness-of-fit tests and no tolerance check (x)", summary);
        Assert.Contains("4 goodness-of-fit diagnostics beside the verdict", summary);
        Assert.Contains("warning GATE3021", stderr); // docs/error-codes.md: a warning under inconclusive: warn
        Assert.Contains("'x' has goodness-of-fit tests and no tolerance check", stderr);

        // The readings are shown with their words, never a verdict's.
        foreach (var test in new[] { "chi2-test", "ks-test", "ad-test", "cvm-test" })
        {
            var row = stdout.Split('\n').Single(l => l.StartsWith("x ", StringComparison.Ordinal) && l.Contains($" {test} ", StringComparison.Ordinal));
            Assert.Matches("(not )?distinguishable at this size", row);
            Assert.DoesNotMatch("(?i)pass|fail|inconclusive|undecided", row);
        }

        var text = File.ReadAllText(Report(".txt"));
        Assert.Contains("diagnostic (not a verdict)", text);
        Assert.StartsWith("UNDECIDED", text.Split('\n').Last(l => l.Length > 0));
        var markdown = File.ReadAllText(Report(".md"));
        Assert.StartsWith("### GateTasks check UNDECIDED", markdown);
        Assert.Contains("GATE3021", markdown);
        Assert.Contains("#### Goodness-of-fit diagnostics (not verdicts)", markdown);
        var html = File.ReadAllText(Report(".html"));
        Assert.Contains("<body data-verdict=\"undecided\">", html);
        Assert.Contains("<section class=\"diagnostics\" id=\"diagnostics\">", html);
        Assert.Equal(4, html.Split("<tr data-reading=\"").Length - 1);

        // JUnit: the tests are properties, not cases; the uncovered feature is one case, skipped under "warn".
        var junit = XDocument.Load(Report(".junit.xml")).Root!;
        var suite = junit.Element("testsuite")!;
        // (Besides the ledger's own case: this contract has no ledger, a warning, docs/ledger.md.)
        Assert.Equal("2", suite.Attribute("tests")!.Value);
        Assert.Equal("1", suite.Attribute("skipped")!.Value);
        Assert.Equal("0", suite.Attribute("failures")!.Value);
        var testCase = Checks(suite).Single();
        Assert.Equal("tolerance coverage", testCase.Attribute("name")!.Value);
        Assert.NotNull(testCase.Element("skipped"));
        Assert.Equal("undecided", Property(junit, "gatetasks.outcome"));
        Assert.Matches("^(not-)?distinguishable$", Property(junit, "gatetasks.diagnostic.x.ks-test"));

        Assert.Equal("undecided", Str(records.Single(r => Str(r, "type") == "outcome"), "outcome"));
        var uncovered = records.Single(r => Str(r, "type") == "diagnostic" && Str(r, "code") == "GATE3021");
        Assert.Equal("warning", Str(uncovered, "severity"));
        Assert.Equal("inconclusive", Str(uncovered, "kind")); // docs/msbuild.md: undecided, not a drift
        Assert.DoesNotContain(records, r => Str(r, "type") == "diagnostic" && Str(r, "code") is "GATE3003" or "GATE3008" or "GATE3011" or "GATE3012");
    }

    [Fact]
    public void Under_inconclusive_fail_a_feature_covered_only_by_tests_fails_the_build_as_undecided()
    {
        Write("reference.csv", Normal(20261210, 0, 20_000));
        Write("sample.csv", Normal(20261211, 0.3, 100));
        File.WriteAllText(Path.Combine(_dir, "contract.yaml"), TestsOnly.Replace("inconclusive: warn", "inconclusive: fail"));
        var (exit, stdout, stderr, _) = Check();

        Assert.True(exit == 5, $"exit {exit}\n{stdout}\n{stderr}"); // docs/cli.md: 5 undecided whatever the policy
        Assert.Contains("error GATE3021", stderr);
        var suite = XDocument.Load(Report(".junit.xml")).Root!.Element("testsuite")!;
        Assert.Equal("1", suite.Attribute("failures")!.Value);
        Assert.Equal("GATE3021", suite.Descendants("failure").Single().Attribute("type")!.Value);
    }

    [Fact]
    public void A_distinguishable_test_beside_met_tolerances_leaves_the_run_passed()
    {
        // 20 000 events shifted by 0.1σ: every tolerance below is met with room, and at this size the tests tell the
        // samples apart. Before, the χ² and KS tests failed the build (GATE3003, GATE3008) though no tolerance was missed.
        Write("reference.csv", Normal(20261212, 0, 20_000));
        Write("sample.csv", Normal(20261213, 0.1, 20_000));
        File.WriteAllText(Path.Combine(_dir, "contract.yaml"), """
            contract-version: 1
            sample: sample.csv
            reference: reference.parquet
            features:
              - name: x
                binning: { bins: 20, spacing: uniform, range: [-4, 4] }
                checks:
                  mean-shift-max: 0.5
                  ks-max: 0.2
                  chi2-test: on
                  ks-test: on
            """);
        var (exit, stdout, stderr, records) = Check();

        Assert.True(exit == 0, $"exit {exit}\n{stdout}\n{stderr}"); // docs/cli.md: 0 passed
        var summary = stdout.Split('\n').Single(l => l.StartsWith("PASSED: ", StringComparison.Ordinal));
        Assert.Contains("2 of 2 checks within tolerance", summary);
        Assert.Contains("2 goodness-of-fit diagnostics beside the verdict (2 distinguishable at this size)", summary);
        Assert.DoesNotContain("GATE30", stderr);
        foreach (var test in new[] { "chi2-test", "ks-test" })
            Assert.Contains("distinguishable at this size", stdout.Split('\n').Single(l => l.StartsWith("x ", StringComparison.Ordinal) && l.Contains($" {test} ", StringComparison.Ordinal)));

        // JUnit: two cases (the tolerances), both passing; the tests only as properties.
        var junit = XDocument.Load(Report(".junit.xml")).Root!;
        var suite = junit.Element("testsuite")!;
        Assert.Equal("3", suite.Attribute("tests")!.Value); // and the ledger's warning case
        Assert.Equal("0", suite.Attribute("failures")!.Value);
        Assert.Equal(new[] { "ks-max", "mean-shift-max" }, Checks(suite).Select(c => c.Attribute("name")!.Value).Order().ToArray());
        Assert.Equal("distinguishable", Property(junit, "gatetasks.diagnostic.x.chi2-test"));
        Assert.Equal("distinguishable", Property(junit, "gatetasks.diagnostic.x.ks-test"));
        Assert.Equal("passed", Str(records.Single(r => Str(r, "type") == "outcome"), "outcome"));
        Assert.Contains("distinguishable at this size", File.ReadAllText(Report(".md")));
        Assert.Contains("<tr data-reading=\"distinguishable\"", File.ReadAllText(Report(".html")));
    }

    [Fact]
    public void A_run_of_tests_alone_is_not_accepted_into_the_ledger_and_ranks_undecided()
    {
        Write("reference.csv", Normal(20261210, 0, 20_000));
        Write("sample.csv", Normal(20261211, 0.3, 100));
        File.WriteAllText(Path.Combine(_dir, "contract.yaml"), TestsOnly);
        Assert.Equal(0, GatetasksProcess.Run(["reference", "build", "--contract", "contract.yaml", "--from", "reference.csv"], _dir).Exit);

        var (exit, stdout, stderr) = GatetasksProcess.Run(["accept", "--contract", "contract.yaml", "--reason", "try", "--by", "Tester"], _dir);
        Assert.True(exit == 2, $"exit {exit}\n{stdout}\n{stderr}"); // docs/error-codes.md: GATE4007, exit 2
        Assert.Contains("GATE4007", stderr);

        var json = Path.Combine(_dir, "rank.json");
        (exit, stdout, stderr) = GatetasksProcess.Run(["rank", "--contract", "contract.yaml", "sample.csv", "--json", json], _dir);
        Assert.True(exit == 1, $"exit {exit}\n{stdout}\n{stderr}"); // docs/cli.md: no candidate passes
        using var doc = JsonDocument.Parse(File.ReadAllText(json));
        var candidate = doc.RootElement.GetProperty("candidates").EnumerateArray().Single();
        Assert.Equal("undecided", candidate.GetProperty("status").GetString());
    }

    private (int Exit, string Stdout, string Stderr, List<JsonElement> Records) Check()
    {
        Assert.Equal(0, GatetasksProcess.Run(["reference", "build", "--contract", "contract.yaml", "--from", "reference.csv"], _dir).Exit);
        var records = Path.Combine(_dir, "records.jsonl");
        var (exit, stdout, stderr) = GatetasksProcess.Run(
            ["check", "--contract", "contract.yaml", "--junit", Report(".junit.xml"), "--text", Report(".txt"), "--html", Report(".html"), "--markdown", Report(".md")],
            _dir, new Dictionary<string, string> { ["GATETASKS_RECORDS"] = records });
        var parsed = File.ReadAllLines(records).Select(l => JsonDocument.Parse(l).RootElement.Clone()).ToList();
        return (exit, stdout, stderr, parsed);
    }

    private string Report(string ending) => Path.Combine(_dir, "r" + ending);

    private static string? Str(JsonElement e, string name) => e.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.String ? v.GetString() : null;

    /// <summary>The suite's cases apart from the ledger's findings.</summary>
    private static IEnumerable<XElement> Checks(XElement suite) =>
        suite.Elements("testcase").Where(c => !c.Attribute("classname")!.Value.EndsWith(".acceptance", StringComparison.Ordinal));

    private static string Property(XElement junit, string name) =>
        junit.Descendants("property").Single(p => p.Attribute("name")!.Value == name).Attribute("value")!.Value;

    private static double[] Normal(int seed, double mean, int count)
    {
        var random = new Random(seed);
        return Enumerable.Range(0, count)
            .Select(_ => mean + Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble())).ToArray();
    }

    private void Write(string name, double[] values)
    {
        var csv = new StringBuilder("x\n");
        foreach (var v in values) csv.Append(v.ToString("R", CultureInfo.InvariantCulture)).Append('\n');
        File.WriteAllText(Path.Combine(_dir, name), csv.ToString());
    }
}
