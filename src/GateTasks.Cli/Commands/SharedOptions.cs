using System.CommandLine;
using GateTasks.Engine.Contracts;

namespace GateTasks.Cli.Commands;

/// <summary>Options several commands take, defined once so their names, aliases and defaults agree.</summary>
internal static class SharedOptions
{
    public static Option<string> Contract(string description = "Precision contract (YAML).") => new Option<string>("--contract", "-c")
    {
        Description = description,
        DefaultValueFactory = _ => PrecisionContract.DefaultFileName,
    }.NotEmpty();

    public static Option<string?> Sample() => new Option<string?>("--sample", "-s")
    {
        Description = "Surrogate sample to use instead of the contract's: a Parquet or CSV file, a folder, or a glob (relative to the working directory).",
    }.NotEmpty();
}
