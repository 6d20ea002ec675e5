using System.CommandLine;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Ledger;

namespace GateTasks.Cli.Commands;

/// <summary>Options several commands take, defined once so their names, aliases and defaults agree.</summary>
internal static class SharedOptions
{
    public static Option<string> Contract(string description = "Precision contract (YAML).") => new Option<string>("--contract", "-c")
    {
        HelpName = "FILE",
        Description = description,
        DefaultValueFactory = _ => PrecisionContract.DefaultFileName,
    }.NotEmpty();

    public static Option<string?> Sample() => new Option<string?>("--sample", "-s")
    {
        HelpName = "FILES",
        Description = "Surrogate sample to use instead of the contract's: a Parquet, CSV, NumPy (.npy, .npz) or HDF5 file, a folder, or a glob (relative to the working directory).",
    }.NotEmpty();

    /// <summary><c>--json FILE</c>: the command's result as a JSON document of the versioned result family (docs/result-json.md).</summary>
    public static Option<string?> Json(string command) => new Option<string?>("--json")
    {
        HelpName = "FILE",
        Description = $"Also write the {command} result as JSON to this path (schema: docs/result.schema.json; a run that does not finish leaves a document saying so).",
    }.NotEmpty();

    public static Option<string?> BaseRevision() => new Option<string?>("--base-revision")
    {
        HelpName = "REVISION",
        Description = "Git revision (e.g. the pull request's target branch) whose acceptance ledger the ledger must extend, entry for entry. " +
                      "Default: the pull-request base CI provides (GITHUB_BASE_REF as origin/BRANCH, CI_MERGE_REQUEST_DIFF_BASE_SHA, " +
                      "SYSTEM_PULLREQUEST_TARGETBRANCH as origin/BRANCH); none otherwise, and the history is not checked.",
    }.NotEmpty();

    /// <summary>Compares the contract's ledger with the base revision in effect (the option, else CI's), with git.</summary>
    public static BaseRevisionCheck.Result CheckHistory(PrecisionContract contract, string? baseRevision) =>
        BaseRevisionCheck.Verify(contract, Engine.Ledger.BaseRevision.Choose(baseRevision, Environment.GetEnvironmentVariable), new GitProcess());
}
