using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Tests.Contracts;

public sealed class RepositoryBoundaryTests : IDisposable
{
    private readonly string _top = Directory.CreateTempSubdirectory("gatetasks-boundary-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_top, recursive: true); } catch (IOException) { }
    }

    /// <summary>A work tree (a folder holding <c>.git</c>) inside the temporary folder, with a contract in analysis/.</summary>
    private string Repository(string reference, string? ledger = null, bool gitFile = false)
    {
        var repo = Path.Combine(_top, "repo");
        Directory.CreateDirectory(Path.Combine(repo, "analysis"));
        if (gitFile) File.WriteAllText(Path.Combine(repo, ".git"), "gitdir: /elsewhere/.git/worktrees/repo\n");
        else Directory.CreateDirectory(Path.Combine(repo, ".git"));
        var contract = Path.Combine(repo, "analysis", "precision-contract.yaml");
        File.WriteAllText(contract, $"""
            contract-version: 1
            sample: /scratch/surrogate/*.parquet
            reference: {reference}
            {(ledger is null ? "" : $"acceptance:\n  ledger: {ledger}\n")}features:
              - name: x
                checks:
                  ks-max: 0.01
            """);
        return contract;
    }

    [Fact]
    public void A_reference_inside_the_work_tree_is_accepted_and_a_sample_outside_is_not_judged()
    {
        var contract = Repository("../reference/ref.parquet");
        var c = ContractLoader.Load(contract);
        Assert.EndsWith(Path.Combine("repo", "reference", "ref.parquet"), c.ReferenceFullPath);
    }

    [Fact]
    public void A_reference_above_the_work_tree_is_refused_at_its_line()
    {
        var contract = Repository("../../elsewhere/ref.parquet");
        var e = Assert.Throws<GateInputException>(() => ContractLoader.Load(contract));
        Assert.Equal(ErrorCodes.ContractPathOutsideRepository, e.Code);
        Assert.Equal((3, 12), (e.Location!.Line, e.Location.Column));
        Assert.Contains("reference", e.Message);
        Assert.Contains("outside the repository", e.Message);
    }

    [Fact]
    public void An_absolute_ledger_path_elsewhere_is_refused_at_its_line()
    {
        var contract = Repository("ref.parquet", ledger: "/tmp/unreviewed.ledger");
        var e = Assert.Throws<GateInputException>(() => ContractLoader.Load(contract));
        Assert.Equal(ErrorCodes.ContractPathOutsideRepository, e.Code);
        Assert.Equal((5, 11), (e.Location!.Line, e.Location.Column));
        Assert.Contains("acceptance ledger", e.Message);
    }

    [Fact]
    public void A_link_inside_the_work_tree_that_points_outside_is_refused()
    {
        var outside = Directory.CreateDirectory(Path.Combine(_top, "outside")).FullName;
        var contract = Repository("linked/ref.parquet");
        Directory.CreateSymbolicLink(Path.Combine(Path.GetDirectoryName(contract)!, "linked"), outside);
        var e = Assert.Throws<GateInputException>(() => ContractLoader.Load(contract));
        Assert.Equal(ErrorCodes.ContractPathOutsideRepository, e.Code);
        Assert.Contains("resolves to " + Path.Combine(outside, "ref.parquet"), e.Message);
    }

    [Fact]
    public void A_link_to_a_file_elsewhere_in_the_work_tree_is_accepted()
    {
        var contract = Repository("current.parquet");
        var folder = Path.GetDirectoryName(contract)!;
        File.WriteAllText(Path.Combine(folder, "v2.parquet"), "");
        File.CreateSymbolicLink(Path.Combine(folder, "current.parquet"), "../analysis/v2.parquet");
        ContractLoader.Load(contract);
    }

    [Fact]
    public void A_link_loop_ends_and_is_judged_by_where_it_got()
    {
        var contract = Repository("loop/ref.parquet");
        var folder = Path.GetDirectoryName(contract)!;
        Directory.CreateSymbolicLink(Path.Combine(folder, "loop"), "loop2");
        Directory.CreateSymbolicLink(Path.Combine(folder, "loop2"), "loop");
        // Inside the work tree however far it follows: accepted here, and the reader then reports the missing file.
        ContractLoader.Load(contract);
    }

    [Fact]
    public void A_worktree_marked_by_a_git_file_is_a_boundary_too()
    {
        var contract = Repository("../../ref.parquet", gitFile: true);
        Assert.Equal(ErrorCodes.ContractPathOutsideRepository, Assert.Throws<GateInputException>(() => ContractLoader.Load(contract)).Code);
    }

    [Fact]
    public void Outside_any_work_tree_there_is_no_boundary()
    {
        var folder = Directory.CreateDirectory(Path.Combine(_top, "loose")).FullName;
        var contract = Path.Combine(folder, "precision-contract.yaml");
        File.WriteAllText(contract, "contract-version: 1\nsample: s.parquet\nreference: ../../ref.parquet\nfeatures:\n  - name: x\n    checks: { ks-max: 0.01 }\n");
        ContractLoader.Load(contract);
    }
}
