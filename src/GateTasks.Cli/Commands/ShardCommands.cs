using System.CommandLine;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Runs;

namespace GateTasks.Cli.Commands;

/// <summary>
/// <c>gatetasks fill</c> and <c>gatetasks merge</c>: fan a check out over shards of a sample (a job array, a CI
/// matrix) and gather it back; <c>gatetasks check --partials</c> decides from the result.
/// </summary>
internal static class ShardCommands
{
    public static Command Fill(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract();
        var sample = new Option<string>("--sample", "-s") { HelpName = "FILES", Description = "The shard to gather: a Parquet, CSV, NumPy (.npy, .npz) or HDF5 file, a folder or a glob.", Required = true }.NotEmpty();
        var output = new Option<string>("--output", "-o") { HelpName = "FILE", Description = "The partial file to write.", Required = true }.NotEmpty();
        var command = new Command("fill", "Gather one shard of a sample into a partial file (histograms, tallies, moments) for 'gatetasks merge' or 'gatetasks check --partials'.")
        {
            contract, sample, output,
        };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
        {
            var loaded = ContractLoader.Load(parse.GetValue(contract)!);
            new RunPaths().Contract(loaded).Read(ContractInputs.SampleFiles(loaded, parse.GetValue(sample)!), "a sample file")
                .Write(parse.GetValue(output)!, "--output").Verify();
            var events = ContractRun.Fill(loaded, parse.GetValue(sample)!, parse.GetValue(output)!, ProgressDisplay.For(stdout, stderr));
            stdout.WriteLine($"partial written: {Path.GetFullPath(parse.GetValue(output)!)} ({events} events)");
            return ExitCodes.Success;
        }));
        return command;
    }

    public static Command Merge(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract();
        var output = new Option<string>("--output", "-o") { HelpName = "FILE", Description = "The merged partial file to write.", Required = true }.NotEmpty();
        var partials = new Argument<string[]>("partials") { Description = "Partial files (or globs) to merge.", Arity = ArgumentArity.OneOrMore }.NotEmpty();
        var command = new Command("merge", "Merge partial files into one; histogram cells and tallies add exactly, in an order that does not depend on the order of the arguments.")
        {
            contract, output, partials,
        };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
        {
            var loaded = ContractLoader.Load(parse.GetValue(contract)!);
            var paths = Expand(parse.GetValue(partials)!);
            new RunPaths().Contract(loaded).Read(paths, "a partial file").Write(parse.GetValue(output)!, "--output").Verify();
            var events = ContractRun.Merge(loaded, paths, parse.GetValue(output)!);
            stdout.WriteLine($"merged {paths.Count} partial files into {Path.GetFullPath(parse.GetValue(output)!)} ({events} events)");
            return ExitCodes.Success;
        }));
        return command;
    }

    /// <summary>Files and globs, each resolved as a sample path is (relative to the working directory).</summary>
    public static IReadOnlyList<string> Expand(IEnumerable<string> patterns) =>
        patterns.SelectMany(p => SampleFiles.Resolve(p, Directory.GetCurrentDirectory())).Distinct(StringComparer.Ordinal).ToList();
}
