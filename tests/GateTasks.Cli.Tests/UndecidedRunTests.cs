using System.Text.Json;
using System.Xml.Linq;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A run that no check failed but some could not decide, under a contract whose inconclusive checks only warn, is
/// UNDECIDED — in the console, every report, the record stream and the exit code (5) — never PASSED; under a contract
/// whose inconclusive checks fail it is UNDECIDED too (never FAILED, which means a tolerance was exceeded), with exit
/// code 5 and its GATE3100 messages as errors. The expectations are the documented behaviour (docs/cli.md,
/// docs/reports.md, docs/msbuild.md); the record stream is read with System.Text.Json, a parser independent of the
/// engine's own. Through the real gatetasks program, in a process of its own.
/// </summary>
public sealed class UndecidedRunTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-undecided-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    /// <summary>
    /// The demo's contract (inconclusive: <paramref name="inconclusive"/>, no ledger) with a reference from 200 000
    /// full-simulation events and a faithful sample of 3 000 others: too few to decide every check, none drifted.
    /// </summary>
    private string Setup(string inconclusive)
    {
        var contractPath = Path.Combine(_dir, DemoContract.FileName);
        File.WriteAllText(contractPath, DemoContract.Text.Replace("path: surrogate-faithful.parquet", "path: surrogate.parquet")
            .Replace("inconclusive: fail", "inconclusive: " + inconclusive));
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 200_000, 31, 50_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));
        DemoSampleWriter.Write(Path.Combine(_dir, "surrogate.parquet"), DemoScenarioParameters.FullSimulation, 3_000, 32, 1_000);
        return contractPath;
    }

    private (int Exit, string Stdout, string Stderr, List<JsonElement> Records) Check(string contract)
    {
        var records = Path.Combine(_dir, "records.jsonl");
        var (exit, stdout, stderr) = GatetasksProcess.Run(
            ["check", "--contract", contract, "--junit", Report(".junit.xml"), "--text", Report(".txt"), "--html", Report(".html"), "--markdown", Report(".md")],
            _dir, new Dictionary<string, string> { ["GATETASKS_RECORDS"] = records });
        var parsed = File.ReadAllLines(records).Select(l => JsonDocument.Parse(l).RootElement.Clone()).ToList();
        return (exit, stdout, stderr, parsed);
    }

    private string Report(string ending) => Path.Combine(_dir, "r" + ending);

    private static string? Str(JsonElement e, string name) => e.TryGetProperty(name, out var v) && v.ValueKind == JsonValueKind.String ? v.GetString() : null;

    [Fact]
    public void Inconclusive_checks_that_only_warn_make_the_run_undecided_not_passed()
    {
        var contract = Setup("warn");
        var (exit, stdout, stderr, records) = Check(contract);

        Assert.True(exit == 5, $"exit {exit}\n{stdout}\n{stderr}"); // docs/cli.md: 5 undecided
        Assert.DoesNotContain("PASSED", stdout);
        var summary = stdout.Split('\n').Single(l => l.StartsWith("UNDECIDED: ", StringComparison.Ordinal));
        Assert.Contains(" 0 failed, ", summary);
        Assert.Contains("Not every tolerance was shown met", summary);
        Assert.Contains("needed to decide", summary);
        Assert.Contains("warning GATE3100", stderr);
        Assert.DoesNotContain("error GATE", stderr);

        // Every report states the same outcome.
        Assert.Contains("UNDECIDED: ", File.ReadAllText(Report(".txt")));
        Assert.DoesNotContain("PASSED", File.ReadAllText(Report(".txt")));
        var html = File.ReadAllText(Report(".html"));
        Assert.Contains("<title>UNDECIDED ", html);
        Assert.Contains("<body data-verdict=\"undecided\">", html);
        Assert.Contains("<span class=\"stamp inconclusive\" id=\"overall\">UNDECIDED</span>", html);
        Assert.StartsWith("### GateTasks check UNDECIDED", File.ReadAllText(Report(".md")));
        var junit = XDocument.Load(Report(".junit.xml")).Root!;
        Assert.Equal("undecided", junit.Descendants("property").Single(p => p.Attribute("name")!.Value == "gatetasks.outcome").Attribute("value")!.Value);
        Assert.Equal("0", junit.Attribute("failures")!.Value);

        // The record stream: version 1 on every record, the outcome, each inconclusive check at its tolerance's line.
        Assert.All(records, r => Assert.Equal(1, r.GetProperty("v").GetInt32()));
        Assert.Equal("undecided", Str(records.Single(r => Str(r, "type") == "outcome"), "outcome"));
        var inconclusive = records.Where(r => Str(r, "type") == "diagnostic" && Str(r, "code") == "GATE3100").ToList();
        Assert.NotEmpty(inconclusive);
        Assert.All(inconclusive, d =>
        {
            Assert.Equal("GATE3100", Str(d, "code"));
            Assert.Equal("warning", Str(d, "severity"));
            Assert.Equal("inconclusive", Str(d, "kind"));
            Assert.Equal(contract, Str(d, "file"));
            Assert.True(d.GetProperty("line").GetInt32() > 0);
            // The console's line is the record, formatted.
            Assert.Contains($"{Str(d, "file")}({d.GetProperty("line").GetInt32()},{d.GetProperty("column").GetInt32()}): warning GATE3100: {Str(d, "text")}", stderr);
        });
        Assert.Equal(summary.TrimEnd('\r'), Str(records.Single(r => Str(r, "type") == "text" && Str(r, "level") == "summary"), "text"));
        Assert.Equal(new[] { "html", "junit", "markdown", "text" },
            records.Where(r => Str(r, "type") == "report").Select(r => Str(r, "kind")).Order().ToArray());
    }

    [Fact]
    public void Under_a_contract_whose_inconclusive_checks_fail_the_run_is_undecided_not_failed_and_exits_non_zero()
    {
        var contract = Setup("fail");
        var (exit, stdout, stderr, records) = Check(contract);

        Assert.True(exit == 5, $"exit {exit}\n{stdout}\n{stderr}"); // docs/cli.md: 5 undecided, whatever the inconclusive policy
        Assert.DoesNotContain("FAILED", stdout);
        Assert.DoesNotContain("PASSED", stdout);
        var summary = stdout.Split('\n').Single(l => l.StartsWith("UNDECIDED: ", StringComparison.Ordinal));
        Assert.Contains(" 0 failed, ", summary);
        Assert.Contains("fail the build under this contract", summary);
        Assert.Contains("error GATE3100", stderr);
        Assert.DoesNotContain("warning GATE3100", stderr);

        // Every report states the same outcome.
        var text = File.ReadAllText(Report(".txt"));
        Assert.Contains("UNDECIDED: ", text);
        Assert.DoesNotContain("FAILED", text);
        var html = File.ReadAllText(Report(".html"));
        Assert.Contains("<title>UNDECIDED ", html);
        Assert.Contains("<body data-verdict=\"undecided\">", html);
        Assert.Contains("<span class=\"stamp inconclusive\" id=\"overall\">UNDECIDED</span>", html);
        Assert.DoesNotContain("FAILED", html);
        var markdown = File.ReadAllText(Report(".md"));
        Assert.StartsWith("### GateTasks check UNDECIDED", markdown);
        Assert.Contains("(inconclusive checks fail the build under this contract)", markdown);
        var junit = XDocument.Load(Report(".junit.xml")).Root!;
        Assert.Equal("undecided", junit.Descendants("property").Single(p => p.Attribute("name")!.Value == "gatetasks.outcome").Attribute("value")!.Value);
        // docs/reports.md: with inconclusive: fail each inconclusive check is a JUnit failure of type GATE3100 (CI shows
        // it red), none of a drift code.
        var failures = junit.Descendants("failure").ToList();
        Assert.NotEmpty(failures);
        Assert.All(failures, f => Assert.Equal("GATE3100", f.Attribute("type")!.Value));

        Assert.Equal("undecided", Str(records.Single(r => Str(r, "type") == "outcome"), "outcome"));
        var inconclusive = records.Where(r => Str(r, "type") == "diagnostic" && Str(r, "code") == "GATE3100").ToList();
        Assert.NotEmpty(inconclusive);
        Assert.All(inconclusive, d => Assert.Equal("error", Str(d, "severity")));
        Assert.Equal(summary.TrimEnd('\r'), Str(records.Single(r => Str(r, "type") == "text" && Str(r, "level") == "summary"), "text"));
    }

    [Fact]
    public void A_run_stopped_by_bad_input_records_that_it_did_not_finish_and_the_error_at_its_place()
    {
        var contract = Setup("warn");
        File.Delete(Path.Combine(_dir, "surrogate.parquet"));
        var (exit, _, stderr, records) = Check(contract);

        Assert.Equal(2, exit); // docs/cli.md: 2 input error
        Assert.Equal("did-not-finish", Str(records.Single(r => Str(r, "type") == "outcome"), "outcome"));
        var error = records.Single(r => Str(r, "type") == "diagnostic");
        Assert.Equal("GATE2001", Str(error, "code")); // docs/error-codes.md: no sample file matches
        Assert.Equal("sample", Str(error, "kind"));
        Assert.Contains($"error GATE2001: {Str(error, "text")}", stderr);
        Assert.StartsWith("DID NOT FINISH: ", File.ReadAllText(Report(".txt")));
        Assert.Contains("<body data-verdict=\"did-not-finish\">", File.ReadAllText(Report(".html")));
        Assert.Equal("did-not-finish", XDocument.Load(Report(".junit.xml")).Root!.Descendants("property")
            .Single(p => p.Attribute("name")!.Value == "gatetasks.outcome").Attribute("value")!.Value);
        Assert.Equal(4, records.Count(r => Str(r, "type") == "report"));
    }

    [Fact]
    public void An_undecided_run_is_not_accepted_into_the_ledger_and_ranks_as_undecided_not_pass()
    {
        var contract = Setup("warn");
        var ledger = Path.Combine(_dir, "precision-contract.ledger");
        var (exit, stdout, stderr) = GatetasksProcess.Run(["accept", "--contract", contract, "--reason", "try", "--by", "Tester"], _dir);

        Assert.True(exit == 2, $"exit {exit}\n{stdout}\n{stderr}"); // docs/error-codes.md: GATE4007, exit 2
        Assert.Contains("GATE4007", stderr);
        Assert.Contains("is undecided", stderr);
        Assert.False(File.Exists(ledger) && File.ReadAllText(ledger).Contains("result", StringComparison.Ordinal), "nothing may be recorded");

        var json = Path.Combine(_dir, "rank.json");
        (exit, stdout, stderr) = GatetasksProcess.Run(["rank", "--contract", contract, "surrogate.parquet", "--json", json], _dir);
        // docs/cli.md: status is pass, undecided, fail or error; no candidate passes, so rank exits 1.
        Assert.True(exit == 1, $"exit {exit}\n{stdout}\n{stderr}");
        using var doc = JsonDocument.Parse(File.ReadAllText(json));
        var candidate = doc.RootElement.GetProperty("candidates").EnumerateArray().Single();
        Assert.Equal("undecided", candidate.GetProperty("status").GetString());
        Assert.False(doc.RootElement.GetProperty("any_passed").GetBoolean());
    }
}
