using System.Text.Json;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary><c>gatetasks rank</c> on the demo checkpoints: order, exit codes, and reports other programs can read.</summary>
public sealed class RankCommandTests(CheckpointSet set) : IClassFixture<CheckpointSet>
{
    private string Glob => Path.Combine(set.Folder, "checkpoints", "epoch-*.parquet");
    private string Out(string name) => Path.Combine(set.Folder, "out-" + Guid.NewGuid().ToString("N")[..8], name);
    private string[] Expected => [.. CheckpointSet.ExpectedOrder.Select(set.Epoch)];

    [Fact]
    public void A_glob_of_checkpoints_is_ranked_best_first_and_written_as_csv_and_json()
    {
        var (csv, json) = (Out("rank.csv"), Out("rank.json"));
        var (code, stdout, stderr) = Cli.Run("rank", "--contract", set.ContractPath, Glob, "--csv", csv, "--json", json);
        Assert.True(code == 0, stdout + stderr); // at least one checkpoint passes
        Assert.Equal("", stderr);

        // The table lists the epochs best first.
        var positions = Expected.Select(p => stdout.IndexOf(p + " ", StringComparison.Ordinal)).ToList();
        Assert.DoesNotContain(-1, positions);
        Assert.Equal(positions.Order(), positions);
        Assert.Contains("2 of 5 candidates pass the contract; best: " + set.Epoch(4), stdout);

        using var doc = JsonDocument.Parse(File.ReadAllText(json));
        var candidates = doc.RootElement.GetProperty("candidates").EnumerateArray().ToList();
        Assert.Equal(Expected, candidates.Select(c => c.GetProperty("candidate").GetString()));
        Assert.Equal([1, 2, 3, 4, 5], candidates.Select(c => c.GetProperty("rank").GetInt32()));
        Assert.Equal(["pass", "pass", "fail", "fail", "fail"], candidates.Select(c => c.GetProperty("status").GetString()));
        Assert.Equal(["first", "worst-margin", "failed", "failed", "failed"], candidates.Select(c => c.GetProperty("decided_by").GetString()));
        Assert.True(doc.RootElement.GetProperty("any_passed").GetBoolean());
        foreach (var c in candidates)
        {
            Assert.Equal(CheckpointSet.CandidateEvents, c.GetProperty("events").GetInt64());
            var checks = c.GetProperty("checks").EnumerateArray().ToList();
            Assert.Equal(14, checks.Count); // 6 on m_gg, 5 on e_lead, 3 on n_jets
            // The worst margin is the lowest of the check margins listed with it.
            Assert.Equal(checks.Min(k => k.GetProperty("margin").GetDouble()), c.GetProperty("worst_margin").GetDouble());
            Assert.Contains(c.GetProperty("worst_check").GetProperty("feature").GetString(), new[] { "m_gg", "e_lead", "n_jets" });
            Assert.Equal(JsonValueKind.Null, c.GetProperty("error").ValueKind);
        }
        Assert.True(File.Exists(csv));
        Assert.Empty(Directory.GetFiles(Path.GetDirectoryName(csv)!, "*.tmp")); // written through a temporary file
    }

    [PythonModulesFact("csv", "json")]
    public void Python_reads_the_csv_and_the_json_back()
    {
        var (csv, json) = (Out("rank.csv"), Out("rank.json"));
        var copy = Path.Combine(set.Folder, "checkpoints-copy", "epoch-4, again.parquet"); // a comma, for the CSV quoting
        Directory.CreateDirectory(Path.GetDirectoryName(copy)!);
        File.Copy(set.Epoch(4), copy, overwrite: true);
        var (code, stdout, stderr) = Cli.Run("rank", "--contract", set.ContractPath, set.Epoch(5), copy, set.Epoch(4), set.Epoch(1), "--csv", csv, "--json", json);
        Assert.True(code == 0, stdout + stderr);

        // Python's csv module (RFC 4180 dialect 'excel') and json module, from Debian's python3.
        const string script = """
            import csv, json, sys
            with open(sys.argv[1], newline='', encoding='utf-8') as f:
                rows = list(csv.DictReader(f))
            with open(sys.argv[2], encoding='utf-8') as f:
                doc = json.load(f)
            out = [[r['rank'], r['candidate'], r['status'], r['decided_by'], r['tied_with_previous'], float(r['worst_margin'])] for r in rows]
            print(json.dumps({'csv': out, 'json': [[c['rank'], c['candidate'], c['worst_margin']] for c in doc['candidates']]}))
            """;
        var (exit, pyOut, pyErr) = ExternalPython.Run(script, [csv, json]);
        Assert.True(exit == 0, pyErr);
        using var parsed = JsonDocument.Parse(pyOut);
        var rows = parsed.RootElement.GetProperty("csv").EnumerateArray().ToList();
        Assert.Equal([copy, set.Epoch(4), set.Epoch(5), set.Epoch(1)], rows.Select(r => r[1].GetString()));
        Assert.Equal(["1", "1", "3", "4"], rows.Select(r => r[0].GetString())); // the identical pair shares rank 1
        Assert.Equal(["first", "tie", "worst-margin", "failed"], rows.Select(r => r[3].GetString()));
        Assert.Equal(["false", "true", "false", "false"], rows.Select(r => r[4].GetString()));
        Assert.Equal(rows[0][5].GetDouble(), rows[1][5].GetDouble());
        var fromJson = parsed.RootElement.GetProperty("json").EnumerateArray().ToList();
        Assert.Equal(rows.Select(r => r[1].GetString()), fromJson.Select(r => r[1].GetString()));
        Assert.Equal(rows.Select(r => r[5].GetDouble()), fromJson.Select(r => r[2].GetDouble()));
        Assert.Contains($"tied with {copy}", stdout);
    }

    [Fact]
    public void A_glob_that_matches_nothing_is_an_input_error_naming_the_pattern()
    {
        var pattern = Path.Combine(set.Folder, "checkpoints", "epoch-*.pq");
        var (code, stdout, stderr) = Cli.Run("rank", "--contract", set.ContractPath, set.Epoch(4), pattern);
        Assert.Equal(2, code);
        Assert.Contains("error GATE2001", stderr);
        Assert.Contains(pattern, stderr);
        Assert.DoesNotContain("checked", stdout); // nothing is checked before every pattern resolves
    }

    [Fact]
    public void When_no_candidate_passes_the_exit_code_is_one()
    {
        var (code, stdout, stderr) = Cli.Run("rank", "--contract", set.ContractPath, set.Epoch(1), set.Epoch(2), set.Epoch(3));
        Assert.True(code == 1, stdout + stderr);
        Assert.Contains("No candidate passes the contract; best: " + set.Epoch(2), stdout);
    }

    [Fact]
    public void An_unreadable_candidate_is_reported_and_exits_two_while_the_others_are_still_ranked()
    {
        var broken = Path.Combine(set.Folder, "broken", "epoch-9.parquet");
        Directory.CreateDirectory(Path.GetDirectoryName(broken)!);
        File.WriteAllBytes(broken, [1, 2, 3]);
        var json = Out("rank.json");
        var (code, stdout, stderr) = Cli.Run("rank", "--contract", set.ContractPath, broken, set.Epoch(5), set.Epoch(4), "--json", json);
        Assert.Equal(2, code);
        Assert.StartsWith($"{broken}: error GATE2002: sample file '{broken}' cannot be read", stderr);
        Assert.Contains($"(candidate {broken}: not ranked)", stderr);
        Assert.True(stdout.IndexOf(set.Epoch(4) + " ", StringComparison.Ordinal) < stdout.IndexOf(set.Epoch(5) + " ", StringComparison.Ordinal));
        Assert.Contains("1 could not be checked", stdout);

        using var doc = JsonDocument.Parse(File.ReadAllText(json));
        var last = doc.RootElement.GetProperty("candidates").EnumerateArray().Last();
        Assert.Equal(broken, last.GetProperty("candidate").GetString());
        Assert.Equal(JsonValueKind.Null, last.GetProperty("rank").ValueKind);
        Assert.Equal("error", last.GetProperty("status").GetString());
        Assert.Equal("GATE2002", last.GetProperty("error").GetProperty("code").GetString());
    }

    [Fact]
    public void Help_lists_rank_with_its_options()
    {
        var (code, stdout, _) = Cli.Run("rank", "--help");
        Assert.Equal(0, code);
        foreach (var word in new[] { "--contract", "--csv", "--json", "candidate" }) Assert.Contains(word, stdout);
        Assert.Contains("rank", Cli.Run("--help").Stdout);
    }

    [Fact]
    public void Rank_without_candidates_is_a_usage_error()
    {
        var (code, _, stderr) = Cli.Run("rank", "--contract", set.ContractPath);
        Assert.Equal(2, code);
        Assert.Contains("GATE0001", stderr);
    }
}
