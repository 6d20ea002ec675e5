using System.CommandLine;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.References;
using GateTasks.Engine.Reports;
using GateTasks.Engine;
using GateTasks.Engine.Samples;

namespace GateTasks.Cli.Commands;

/// <summary><c>gatetasks reference build|show</c>: makes a reference from a trusted sample, or prints one.</summary>
internal static class ReferenceCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var command = new Command("reference", "Build or inspect reference histograms.");
        command.Subcommands.Add(Build(stdout, stderr));
        command.Subcommands.Add(Show(stdout, stderr));
        return command;
    }

    private static Command Build(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract("Precision contract whose features and binning the reference is built for.");
        var from = new Option<string>("--from")
        {
            HelpName = "FILES",
            Description = "Trusted full-simulation sample: a Parquet, CSV, NumPy (.npy, .npz) or HDF5 file, a folder, or a glob.",
            Required = true,
        }.NotEmpty();
        var weight = new Option<string?>("--weight")
        {
            HelpName = "COLUMN",
            Description = "Weight column of the trusted sample (default: the contract's sample weight column).",
        };
        var output = new Option<string?>("--output", "-o")
        {
            HelpName = "FILE",
            Description = "Where to write the reference (default: the contract's reference path).",
        }.NotEmpty();
        var command = new Command("build", "Build the reference file from a trusted sample.") { contract, from, weight, output };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
        {
            var loaded = ContractLoader.Load(parse.GetValue(contract)!);
            var files = SampleFiles.Resolve(parse.GetValue(from)!, Directory.GetCurrentDirectory());
            var target = parse.GetValue(output) is { } o ? Path.GetFullPath(o) : loaded.ReferenceFullPath;
            new RunPaths().Read(loaded.FilePath, "the contract").Keep(loaded.LedgerFullPath, "the contract's acceptance ledger").Read(files, "a trusted sample file")
                .Write(target, parse.GetValue(output) is null ? "the reference (the contract's)" : "--output").Verify();
            var reference = ReferenceBuilder.Build(loaded, files, parse.GetValue(weight) ?? loaded.Sample.Weight, ToolVersion.Current, ProgressDisplay.For(stdout, stderr));
            ReferenceFile.Write(target, reference);
            stdout.WriteLine($"Reference written: {target}");
            stdout.WriteLine($"  {reference.Features.Count} features from {reference.Events} events in {files.Count} file(s).");
            return ExitCodes.Success;
        }));
        return command;
    }

    private static Command Show(TextWriter stdout, TextWriter stderr)
    {
        var file = new Argument<string>("file") { Description = "Reference file to print." }.NotEmpty();
        var bins = new Option<bool>("--bins") { Description = "Also list every bin." };
        var command = new Command("show", "Print a reference file readably.") { file, bins };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
        {
            var path = parse.GetValue(file)!;
            new RunPaths().Read(path, "the reference").VerifyInputs();
            stdout.Write(ReferenceDescription.Format(path, ReferenceFile.Read(path), parse.GetValue(bins)));
            return ExitCodes.Success;
        }));
        return command;
    }
}
