using GateTasks.Cli.Tests.Corpus;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The ledger held to its committed history (docs/ledger.md, "The base revision"): in a real temporary Git
/// repository, through the gatetasks program, an accepted entry edited and resealed passes the seals but not the
/// comparison with the base revision. The expectations are the documented behaviour (docs/error-codes.md); the
/// resealing follows the ledger format as docs/ledger.md states it, so these tests compare the program with itself.
/// </summary>
public sealed class LedgerBaseRevisionTests : IDisposable
{
    private readonly string _folder = Directory.CreateTempSubdirectory("gatetasks-ledger-git-").FullName;
    private string Ledger => Path.Combine(_folder, "contract.ledger");

    public void Dispose()
    {
        try { Directory.Delete(_folder, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
    }

    [GitFact]
    public void An_entry_edited_and_resealed_passes_the_seals_but_not_the_base_revision()
    {
        CommitTwoEntriesOnMainThenBranch();
        var line = EntryLine(1);
        LedgerReseal.Edit(Ledger, "why \"first acceptance\"", "why \"first acceptance, widened\"");

        // Without a base revision the resealed ledger still passes, and the output says the history was not checked.
        var (exit, stdout, stderr) = Gatetasks("check");
        Assert.True(exit == 0, stdout + stderr);
        Assert.Contains("ledger history: not checked", stdout);

        (exit, stdout, stderr) = Gatetasks("check", "--base-revision", "main");
        Assert.True(exit == 4, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains($"contract.ledger({line},1): error GATE4002: Entry 1 (line {line}) is not the entry accepted at base revision main", stderr);
        Assert.Contains("first acceptance, widened", stderr);
    }

    [GitFact]
    public void An_appended_entry_extends_the_base_revision()
    {
        CommitTwoEntriesOnMainThenBranch();
        Succeed("accept", "--reason", "third acceptance", "--by", "Tester <tester@example.org>", "--base-revision", "main");

        var (exit, stdout, stderr) = Gatetasks("check", "--base-revision", "main");
        Assert.True(exit == 0, stdout + stderr);
        Assert.Contains("ledger history: extends the 2 accepted entries at base revision main", stdout);
        Assert.Contains("1 added", stdout);
    }

    [GitFact]
    public void A_deleted_entry_is_missing_against_the_base_revision()
    {
        CommitTwoEntriesOnMainThenBranch();
        var lines = File.ReadAllLines(Ledger);
        var second = EntryLine(2);
        File.WriteAllLines(Ledger, lines[..(second - 1)]);

        var (exit, stdout, stderr) = Gatetasks("check");
        Assert.True(exit == 0, stdout + stderr); // the chain of what is left is intact

        (exit, stdout, stderr) = Gatetasks("check", "--base-revision", "main");
        Assert.True(exit == 4, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4002: Entry 2, accepted at base revision main", stderr);
        Assert.Contains("is missing", stderr);
    }

    [GitFact]
    public void A_removed_ledger_is_caught_against_the_base_revision()
    {
        CommitTwoEntriesOnMainThenBranch();
        File.Delete(Ledger);

        var (exit, stdout, stderr) = Gatetasks("check", "--base-revision", "main");
        Assert.True(exit == 4, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4002: The acceptance ledger", stderr);
        Assert.Contains("was removed", stderr);
    }

    [GitFact]
    public void An_unknown_base_revision_is_an_error_not_a_pass()
    {
        CommitTwoEntriesOnMainThenBranch();
        var (exit, stdout, stderr) = Gatetasks("check", "--base-revision", "no-such-branch", "--junit", "report.xml");
        Assert.True(exit == 2, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4012: The base revision no-such-branch names no commit", stderr);
        Assert.DoesNotContain("PASSED", File.ReadAllText(Path.Combine(_folder, "report.xml")));
    }

    [GitFact]
    public void The_pull_request_base_from_CI_is_the_default()
    {
        CommitTwoEntriesOnMainThenBranch();
        LedgerReseal.Edit(Ledger, "why \"second acceptance\"", "why \"second acceptance, widened\"");
        var github = new Dictionary<string, string> { ["GITHUB_BASE_REF"] = "main" };

        // GitHub Actions names the target branch; it is read as origin/main, which a shallow clone may lack: an error, never a pass.
        var (exit, stdout, stderr) = Gatetasks(github, "check");
        Assert.True(exit == 2, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4012: The base revision origin/main (from GITHUB_BASE_REF) names no commit", stderr);

        Git("update-ref", "refs/remotes/origin/main", "main");
        (exit, stdout, stderr) = Gatetasks(github, "check");
        Assert.True(exit == 4, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains($"contract.ledger({EntryLine(2)},1): error GATE4002: Entry 2", stderr);

        // GitLab gives the merge request's base commit itself.
        var gitlab = new Dictionary<string, string> { ["CI_MERGE_REQUEST_DIFF_BASE_SHA"] = Git("rev-parse", "main").Trim() };
        (exit, stdout, stderr) = Gatetasks(gitlab, "check");
        Assert.True(exit == 4, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4002: Entry 2", stderr);
    }

    [GitFact]
    public void A_ledger_new_since_the_base_revision_has_nothing_to_extend()
    {
        Setup();
        Git("add", "contract.yaml", "reference.csv", "sample.csv", "reference.parquet");
        Git("commit", "-q", "-m", "contract without a ledger");
        Git("checkout", "-q", "-b", "feature");
        Succeed("accept", "--reason", "first acceptance", "--by", "Tester <tester@example.org>");

        var (exit, stdout, stderr) = Gatetasks("check", "--base-revision", "main");
        Assert.True(exit == 0, stdout + stderr);
        Assert.Contains("ledger history: no ledger at base revision main", stdout);
    }

    [GitFact]
    public void Accept_and_history_refuse_a_ledger_that_rewrote_the_base_revision()
    {
        CommitTwoEntriesOnMainThenBranch();
        LedgerReseal.Edit(Ledger, "why \"first acceptance\"", "why \"first acceptance, widened\"");
        var before = File.ReadAllText(Ledger);

        var (exit, stdout, stderr) = Gatetasks("accept", "--reason", "on top", "--by", "Tester <tester@example.org>", "--base-revision", "main");
        Assert.True(exit == 2, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4002: Not accepted: Entry 1", stderr);
        Assert.Equal(before, File.ReadAllText(Ledger));

        (exit, stdout, stderr) = Gatetasks("history", "--base-revision", "main");
        Assert.True(exit == 2, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4002: Entry 1", stderr);
    }

    [GitFact]
    public void A_broken_ledger_at_the_base_revision_is_an_error_not_a_pass()
    {
        Setup();
        Succeed("accept", "--reason", "first acceptance", "--by", "Tester <tester@example.org>");
        var intact = File.ReadAllText(Ledger);
        File.WriteAllText(Ledger, intact.Replace("first acceptance", "first acceptance, edited", StringComparison.Ordinal));
        Git("add", "-A");
        Git("commit", "-q", "-m", "an entry edited without resealing");
        Git("checkout", "-q", "-b", "feature");
        File.WriteAllText(Ledger, intact);

        var (exit, stdout, stderr) = Gatetasks("check", "--base-revision", "main");
        Assert.True(exit == 2, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4015: The ledger as committed at base revision main", stderr);
    }

    [GitFact]
    public void Outside_a_repository_a_base_revision_is_an_error()
    {
        CorpusData.Write(_folder);
        File.Copy(Path.Combine(CorpusCase.BaseFolder, "contract.yaml"), Path.Combine(_folder, "contract.yaml"));
        Succeed("reference", "build", "--from", "reference.csv");
        var (exit, stdout, stderr) = Gatetasks("check", "--base-revision", "main");
        Assert.True(exit == 2, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4013", stderr);
        Assert.Contains("not a git repository", stderr);
    }

    [GitFact]
    public void Without_git_a_base_revision_is_an_error()
    {
        CommitTwoEntriesOnMainThenBranch();
        var empty = Directory.CreateDirectory(Path.Combine(_folder, "no-programs")).FullName;
        var (exit, stdout, stderr) = Gatetasks(new Dictionary<string, string> { ["PATH"] = empty }, "check", "--base-revision", "main");
        Assert.True(exit == 2, $"exit {exit}\n{stdout}{stderr}");
        Assert.Contains("error GATE4011", stderr);
        Assert.Contains("git program cannot be started", stderr);
    }

    private void Setup()
    {
        Git("init", "-q", "-b", "main");
        Git("config", "user.email", "tester@example.org");
        Git("config", "user.name", "Tester");
        Git("config", "commit.gpgsign", "false");
        CorpusData.Write(_folder);
        File.Copy(Path.Combine(CorpusCase.BaseFolder, "contract.yaml"), Path.Combine(_folder, "contract.yaml"));
        Succeed("reference", "build", "--from", "reference.csv");
    }

    private void CommitTwoEntriesOnMainThenBranch()
    {
        Setup();
        Succeed("accept", "--reason", "first acceptance", "--by", "Tester <tester@example.org>");
        Succeed("accept", "--reason", "second acceptance", "--by", "Tester <tester@example.org>");
        Git("add", "contract.yaml", "contract.ledger", "reference.csv", "sample.csv", "reference.parquet");
        Git("commit", "-q", "-m", "accepted twice");
        Git("checkout", "-q", "-b", "feature");
    }

    /// <summary>The 1-based line of entry <paramref name="number"/>'s header in the ledger.</summary>
    private int EntryLine(int number) => Array.IndexOf(File.ReadAllLines(Ledger), $"[accepted {number}]") + 1;

    private (int Exit, string Stdout, string Stderr) Gatetasks(params string[] args) => Gatetasks(null, args);

    private (int Exit, string Stdout, string Stderr) Gatetasks(IReadOnlyDictionary<string, string>? environment, params string[] args) =>
        GatetasksProcess.Run(args.Concat(["--contract", "contract.yaml"]), _folder, environment);

    private void Succeed(params string[] args)
    {
        var (exit, stdout, stderr) = Gatetasks(args);
        Assert.True(exit == 0, $"gatetasks {string.Join(' ', args)}: exit {exit}\n{stdout}{stderr}");
    }

    private string Git(params string[] args)
    {
        var (exit, stdout, stderr) = ProcessRunner.Run("git", args, _folder);
        Assert.True(exit == 0, $"git {string.Join(' ', args)}: exit {exit}\n{stdout}{stderr}");
        return stdout;
    }
}
