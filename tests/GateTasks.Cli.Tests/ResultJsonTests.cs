using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using GateTasks.Cli.Tests.Corpus;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The JSON results of check, accept, rank and plan (<c>--json FILE</c>): each validates against docs/result.schema.json
/// under an independent validator (Debian's python3-jsonschema), a broken document does not, and a run that does not
/// finish leaves a document saying so, never an earlier result. Run as a build runs the program, in a process of its
/// own, on the corpus's small base data (tests/corpus/README.md). The expectations are the documented behaviour
/// (docs/result-json.md).
/// </summary>
public sealed class ResultJsonTests : IDisposable
{
    private readonly string _dir;

    public ResultJsonTests()
    {
        _dir = Directory.CreateTempSubdirectory("gatetasks-json-").FullName;
        Directory.CreateDirectory(Path.Combine(_dir, ".git"));
        CorpusData.Write(_dir);
        File.Copy(Path.Combine(CorpusCase.BaseFolder, "contract.yaml"), Path.Combine(_dir, "contract.yaml"));
        var (exit, stdout, stderr) = Gatetasks("reference", "build", "--contract", "contract.yaml", "--from", "reference.csv");
        Assert.True(exit == 0, stdout + stderr);
        WriteShifted("sample.csv", "shifted.csv", "x", 1.0);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
    }

    private (int Exit, string Stdout, string Stderr) Gatetasks(params string[] args) => GatetasksProcess.Run(args, _dir, timeoutSeconds: 300);

    private string In(string name) => Path.Combine(_dir, name);

    private static JsonNode Read(string path) => JsonNode.Parse(File.ReadAllText(path))!;

    /// <summary>A copy of a CSV sample with one column shifted: a surrogate that fails its KS check.</summary>
    private void WriteShifted(string from, string to, string column, double by)
    {
        var lines = File.ReadAllLines(In(from));
        var index = Array.IndexOf(lines[0].Split(','), column);
        Assert.True(index >= 0, lines[0]);
        File.WriteAllLines(In(to), lines.Select((line, i) =>
        {
            if (i == 0) return line;
            var cells = line.Split(',');
            cells[index] = (double.Parse(cells[index], CultureInfo.InvariantCulture) + by).ToString("R", CultureInfo.InvariantCulture);
            return string.Join(',', cells);
        }));
    }

    [PythonModulesFact("jsonschema")]
    public void Every_command_writes_a_json_result_that_validates_against_the_schema()
    {
        var passed = Gatetasks("check", "--contract", "contract.yaml", "--json", "passed.json");
        Assert.True(passed.Exit == 0, passed.Stdout + passed.Stderr);
        var failed = Gatetasks("check", "--contract", "contract.yaml", "--sample", "shifted.csv", "--json", "failed.json");
        Assert.True(failed.Exit == 1, failed.Stdout + failed.Stderr);
        var unfinished = Gatetasks("check", "--contract", "contract.yaml", "--sample", "missing.csv", "--json", "unfinished.json");
        Assert.Equal(2, unfinished.Exit);
        var refused = Gatetasks("accept", "--contract", "contract.yaml", "--sample", "shifted.csv", "--reason", "r", "--by", "t", "--json", "refused.json");
        Assert.Equal(2, refused.Exit);
        var accepted = Gatetasks("accept", "--contract", "contract.yaml", "--reason", "first state", "--by", "t", "--json", "accepted.json");
        Assert.True(accepted.Exit == 0, accepted.Stdout + accepted.Stderr);
        var ranked = Gatetasks("rank", "--contract", "contract.yaml", "sample.csv", "shifted.csv", "--json", "rank.json");
        Assert.True(ranked.Exit == 0, ranked.Stdout + ranked.Stderr);
        var planned = Gatetasks("plan", "--contract", "contract.yaml", "--replicas", "20", "--json", "plan.json");
        Assert.True(planned.Exit == 0, planned.Stdout + planned.Stderr);

        string[] documents = ["passed.json", "failed.json", "unfinished.json", "refused.json", "accepted.json", "rank.json", "plan.json"];
        var (exit, output) = ResultSchemaValidator.Validate([.. documents.Select(In)]);

        // Independent validator: Debian's python3-jsonschema, Draft202012Validator (docs/result.schema.json declares draft 2020-12).
        Assert.True(exit == 0, output);
        Assert.StartsWith("jsonschema 4.", ResultSchemaValidator.VersionLine(output));
        Assert.Equal(documents.Length, output.Split('\n').Count(l => l.EndsWith(" valid", StringComparison.Ordinal)));
        // What each document says (the program compared with its own exit codes and the documented fields).
        Assert.Equal("passed", (string)Read(In("passed.json"))["outcome"]!);
        Assert.Equal("failed", (string)Read(In("failed.json"))["outcome"]!);
        Assert.Equal("did-not-finish", (string)Read(In("unfinished.json"))["outcome"]!);
        Assert.Equal("GATE2001", (string)Read(In("unfinished.json"))["error"]!["code"]!);
        Assert.Null(Read(In("refused.json"))["accepted_entry"]);
        Assert.Equal("failed", (string)Read(In("refused.json"))["outcome"]!);
        Assert.Equal(1, (int)Read(In("accepted.json"))["accepted_entry"]!);
        foreach (var (name, command) in new[] { ("passed.json", "check"), ("accepted.json", "accept"), ("rank.json", "rank"), ("plan.json", "plan") })
        {
            var doc = Read(In(name));
            Assert.Equal(command, (string)doc["command"]!);
            Assert.Equal(1, (int)doc["schema_version"]!);
        }
    }

    [PythonModulesFact("jsonschema")]
    public void A_document_that_breaks_the_schema_is_rejected()
    {
        var run = Gatetasks("check", "--contract", "contract.yaml", "--sample", "shifted.csv", "--json", "good.json");
        Assert.True(run.Exit == 1, run.Stdout + run.Stderr);
        var good = File.ReadAllText(In("good.json"));
        // Each mutation breaks one documented rule; the untouched document is validated beside them.
        var mutations = new Dictionary<string, Action<JsonObject>>
        {
            ["no-headroom"] = d => d["checks"]![0]!.AsObject().Remove("headroom"),
            ["share-as-text"] = d => d["checks"]![0]!["headroom"]!["upper_share"] = "64%",
            ["unknown-outcome"] = d => d["outcome"] = "PASSED",
            ["future-version"] = d => d["schema_version"] = 2,
            ["finished-without-checks"] = d => d.Remove("checks"),
            ["bad-verdict"] = d => d["checks"]![0]!["verdict"] = "ok",
            ["extra-field"] = d => d["checks"]![0]!["margin"] = 0.5,
        };
        var files = new List<string> { In("good.json") };
        foreach (var (name, mutate) in mutations)
        {
            var doc = JsonNode.Parse(good)!.AsObject();
            mutate(doc);
            File.WriteAllText(In(name + ".json"), doc.ToJsonString());
            files.Add(In(name + ".json"));
        }
        // A NaN literal is not JSON: a writer that let one through must be caught.
        File.WriteAllText(In("nan-literal.json"), good.Replace("\"estimate\": ", "\"estimate\": NaN, \"_\": "));
        files.Add(In("nan-literal.json"));

        var (exit, output) = ResultSchemaValidator.Validate([.. files]);

        // Debian's python3-jsonschema (Draft202012Validator) rejects every broken document and accepts the original.
        Assert.Equal(1, exit);
        Assert.Contains(In("good.json") + " valid", output);
        foreach (var f in files.Skip(1)) Assert.Contains(f + " invalid", output);
    }

    [Fact]
    public void A_run_that_does_not_finish_leaves_json_that_says_so_never_an_earlier_passed()
    {
        const string earlier = """{"schema_version": 1, "command": "check", "finished": true, "outcome": "passed"}""";
        (string Name, string[] Args, string Code)[] runs =
        [
            ("check.json", ["check", "--contract", "contract.yaml", "--sample", "missing.csv", "--json", "check.json"], "GATE2001"),
            ("accept.json", ["accept", "--contract", "contract.yaml", "--sample", "missing.csv", "--reason", "r", "--by", "t", "--json", "accept.json"], "GATE2001"),
            ("rank.json", ["rank", "--contract", "contract.yaml", "missing-*.csv", "--json", "rank.json"], "GATE2001"),
            ("plan.json", ["plan", "--contract", "contract.yaml", "--power", "2", "--json", "plan.json"], "GATE0001"),
            ("broken-contract.json", ["check", "--contract", "no-such-contract.yaml", "--json", "broken-contract.json"], "GATE1001"),
            ("other-output-refused.json", ["rank", "--contract", "contract.yaml", "sample.csv", "--csv", "sample.csv", "--json", "other-output-refused.json"], "GATE0004"),
        ];
        foreach (var (name, args, code) in runs)
        {
            File.WriteAllText(In(name), earlier);
            var run = Gatetasks(args);
            Assert.True(run.Exit == 2, $"{name}: exit {run.Exit}\n{run.Stdout}{run.Stderr}");
            var doc = Read(In(name));
            Assert.False((bool)doc["finished"]!, name);
            Assert.Equal("did-not-finish", (string)doc["outcome"]!);
            Assert.Equal("stopped", (string)doc["state"]!);
            Assert.True(code == (string)doc["error"]!["code"]!, $"{name}: {doc}");
            Assert.Contains($"error {code}:", run.Stderr);
        }
        Assert.Empty(Directory.EnumerateFiles(_dir, "*.tmp"));
    }

    [Fact]
    public void While_a_run_is_under_way_its_json_says_it_has_not_finished()
    {
        // What a killed run leaves: the marker written before any work.
        var path = In("running.json");
        File.WriteAllText(path, """{"outcome": "passed"}""");
        Engine.Reports.UnfinishedReport.Clear(new(null, null, null, null, path, "rank"));
        Engine.Reports.UnfinishedReport.MarkRunning(new(null, null, null, null, path, "rank"), In("contract.yaml"), DateTimeOffset.UtcNow);

        var doc = Read(path);
        Assert.Equal("rank", (string)doc["command"]!);
        Assert.Equal("running", (string)doc["state"]!);
        Assert.Equal("did-not-finish", (string)doc["outcome"]!);
        Assert.Equal("GATE0003", (string)doc["error"]!["code"]!);
    }
}
