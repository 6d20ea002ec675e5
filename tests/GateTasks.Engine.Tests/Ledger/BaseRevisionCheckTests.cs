using System.Text;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ledger;

namespace GateTasks.Engine.Tests.Ledger;

/// <summary>
/// The base revision rule (docs/ledger.md, "The base revision") with a scripted git in place of the program: which
/// revision is in effect, and each way the comparison cannot be made. The expectations are the documented behaviour;
/// the real git and the real program are exercised by GateTasks.Cli.Tests' LedgerBaseRevisionTests.
/// </summary>
public sealed class BaseRevisionCheckTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-base-revision-").FullName;
    private static readonly DateTimeOffset When = new(2026, 12, 2, 9, 30, 0, TimeSpan.Zero);
    private const string Commit = "0123456789abcdef0123456789abcdef01234567";

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private string LedgerPath => Path.Combine(_dir, "precision-contract.ledger");

    private PrecisionContract Contract()
    {
        var path = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(path, """
            contract-version: 1
            title: base-revision-case
            sample: surrogate.csv
            reference: ref.parquet
            features:
              - name: x
                checks:
                  ks-max: 0.03
            """);
        return ContractLoader.Load(path);
    }

    /// <summary>A ledger of two entries, written by the program's own writer.</summary>
    private byte[] TwoEntries(string secondReason = "reason 2")
    {
        File.Delete(LedgerPath);
        for (var n = 1; n <= 2; n++)
        {
            var existing = File.Exists(LedgerPath) ? LedgerFile.Read(LedgerPath) : [];
            LedgerFile.Append(LedgerPath, existing, new LedgerEntry(0, When, "Tester <t@example.org>", n == 1 ? "reason 1" : secondReason, "c", "precision-contract.yaml",
                "r", "ref.parquet", "s", "note", new AcceptedState([new("confidence", "0.95")], null, [], []), "", ""));
        }
        return File.ReadAllBytes(LedgerPath);
    }

    /// <summary>Answers each git command from a script; null stands for a git that cannot be started.</summary>
    private sealed class ScriptedGit(Func<IReadOnlyList<string>, GitResult?> answer) : IGitCommandLine
    {
        public List<string> Calls { get; } = [];

        public GitResult? Run(string workingDirectory, IReadOnlyList<string> arguments)
        {
            Calls.Add(string.Join(' ', arguments));
            return answer(arguments);
        }
    }

    private static GitResult Ok(string text) => new(0, Encoding.UTF8.GetBytes(text + "\n"), "");

    private static ScriptedGit Repository(byte[]? ledgerAtBase, string kind = "blob") => new(args => (args[0], args[1]) switch
    {
        ("rev-parse", "--show-toplevel") => Ok("/repo"),
        ("rev-parse", "--verify") => args[3] == "main^{commit}" ? Ok(Commit) : new GitResult(1, [], ""),
        ("cat-file", "-t") => ledgerAtBase is null ? new GitResult(128, [], "fatal: path does not exist") : Ok(kind),
        ("cat-file", "blob") => new GitResult(0, ledgerAtBase!, ""),
        _ => throw new InvalidOperationException("unexpected git " + string.Join(' ', args)),
    });

    [Fact]
    public void The_option_comes_first_then_the_pull_request_base_each_CI_names()
    {
        string? None(string _) => null;
        Assert.Null(BaseRevision.Choose(null, None));
        Assert.Equal("v1.2", BaseRevision.Choose("v1.2", v => v == "GITHUB_BASE_REF" ? "main" : null)!.Revision);
        // GitHub Actions gives the target branch's name, fetched as a remote-tracking branch.
        Assert.Equal("origin/main", BaseRevision.Choose(null, v => v == "GITHUB_BASE_REF" ? "main" : null)!.Revision);
        // GitLab gives the merge request's base commit.
        Assert.Equal(Commit, BaseRevision.Choose(null, v => v == "CI_MERGE_REQUEST_DIFF_BASE_SHA" ? Commit : null)!.Revision);
        // Azure Pipelines gives a full ref name for Azure Repos.
        Assert.Equal("origin/release/2", BaseRevision.Choose(null, v => v == "SYSTEM_PULLREQUEST_TARGETBRANCH" ? "refs/heads/release/2" : null)!.Revision);
        // An empty variable is no pull request.
        Assert.Null(BaseRevision.Choose(null, v => v == "GITHUB_BASE_REF" ? "" : null));
    }

    [Theory]
    [InlineData("")]
    [InlineData("  ")]
    [InlineData("--output=x")]
    [InlineData("main branch")]
    public void A_base_revision_that_is_no_revision_name_is_a_usage_error(string option)
    {
        var e = Assert.Throws<GateInputException>(() => BaseRevision.Choose(option, _ => null));
        Assert.Equal(ErrorCodes.Usage, e.Code);
    }

    [Fact]
    public void Without_a_base_revision_nothing_runs_and_the_note_says_so()
    {
        var git = Repository(null);
        var result = BaseRevisionCheck.Verify(Contract(), null, git);
        Assert.Null(result.Finding);
        Assert.StartsWith("ledger history: not checked", result.Note);
        Assert.Empty(git.Calls);
    }

    [Fact]
    public void Each_way_the_comparison_cannot_be_made_has_its_code()
    {
        var contract = Contract();
        var main = new BaseRevision("main", "--base-revision");
        Assert.Equal(ErrorCodes.GitUnavailable, Assert.Throws<GateInputException>(() => BaseRevisionCheck.Verify(contract, main, new ScriptedGit(_ => null))).Code);
        Assert.Equal(ErrorCodes.GitFailed, Assert.Throws<GateInputException>(() =>
            BaseRevisionCheck.Verify(contract, main, new ScriptedGit(_ => new GitResult(128, [], "fatal: not a git repository")))).Code);
        Assert.Equal(ErrorCodes.BaseRevisionUnknown, Assert.Throws<GateInputException>(() =>
            BaseRevisionCheck.Verify(contract, new BaseRevision("gone", "--base-revision"), Repository(null))).Code);
        var broken = Assert.Throws<GateInputException>(() => BaseRevisionCheck.Verify(contract, main, Repository("[accepted 1]\nwhen x\n"u8.ToArray())));
        Assert.Equal(ErrorCodes.BaseLedgerUnreadable, broken.Code);
        Assert.Equal(LedgerPath, broken.Location!.File);
    }

    [Fact]
    public void No_ledger_file_at_the_base_is_a_new_ledger()
    {
        var contract = Contract();
        TwoEntries();
        var main = new BaseRevision("main", "--base-revision");
        Assert.Contains("no ledger at base revision main", BaseRevisionCheck.Verify(contract, main, Repository(null)).Note);
        // A folder of that name at the base is no ledger either.
        Assert.Null(BaseRevisionCheck.Verify(contract, main, Repository([], kind: "tree")).Finding);
    }

    [Fact]
    public void Line_ends_and_a_byte_order_mark_are_not_differences_but_one_changed_byte_is()
    {
        var contract = Contract();
        var main = new BaseRevision("main", "--base-revision");
        var committed = TwoEntries();

        // Git may check a file out with CR LF line ends (core.autocrlf); a Windows editor may add a byte-order mark.
        File.WriteAllBytes(LedgerPath, [.. Encoding.UTF8.Preamble, .. Encoding.UTF8.GetBytes(Encoding.UTF8.GetString(committed).Replace("\n", "\r\n"))]);
        var same = BaseRevisionCheck.Verify(contract, main, Repository(committed));
        Assert.Null(same.Finding);
        Assert.Contains("extends the 2 accepted entries", same.Note);

        // Two byte sequences that are not UTF-8 both read as U+FFFD, so the seals cannot tell them apart; the bytes can.
        var withReplacement = TwoEntries("reason \uFFFD");
        byte[] With(byte b)
        {
            var text = withReplacement.ToList();
            var at = withReplacement.AsSpan().IndexOf("\uFFFD"u8);
            text.RemoveRange(at, 3);
            text.Insert(at, b);
            return [.. text];
        }
        File.WriteAllBytes(LedgerPath, With(0xFE));
        Assert.Equal(2, LedgerFile.Read(LedgerPath).Count); // the chain holds
        var differs = BaseRevisionCheck.Verify(contract, main, Repository(With(0xFF)));
        Assert.Equal(ErrorCodes.LedgerTampered, differs.Finding!.Code);
        var second = LedgerFile.Read(LedgerPath)[1];
        Assert.Equal(new SourceLocation(LedgerPath, second.Line, 1), differs.Finding.Location);
        Assert.Contains("Entry 2", differs.Finding.Message);
    }
}
