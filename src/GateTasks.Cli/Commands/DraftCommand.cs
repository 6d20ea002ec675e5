using System.CommandLine;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Drafting;
using GateTasks.Engine.IO;
using GateTasks.Engine.Samples;

namespace GateTasks.Cli.Commands;

/// <summary>
/// <c>gatetasks draft</c>: writes a starter contract from a trusted sample, every tolerance derived from the analysis's
/// expected number of data events and the share of their statistical uncertainty the surrogate's bias may take, and
/// raised to what a perfect surrogate can pass against a reference built from the same sample.
/// </summary>
internal static class DraftCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var from = new Option<string>("--from") { HelpName = "FILES", Description = "Trusted full-simulation sample: a Parquet, CSV, NumPy (.npy, .npz) or HDF5 file, a folder, or a glob.", Required = true }.NotEmpty();
        var dataEvents = new Option<long>("--data-events")
        {
            HelpName = "N",
            Description = "How many data events the analysis expects (after its selection): the statistical precision the tolerances derive from.",
            Required = true,
        };
        // No default shown by the parser: it would print 1/3 as 0.3333333333333333.
        var coreShare = new Option<double?>("--bias-fraction")
        {
            HelpName = "FRACTION",
            Description = "Largest bias in the core as a fraction of the data's statistical uncertainty (default: 1/3).",
        };
        var tailShare = new Option<double>("--tail-bias-fraction")
        {
            HelpName = "FRACTION",
            Description = "The same in the tails, where analyses rarely fit.",
            DefaultValueFactory = _ => DraftOptions.DefaultTailFraction,
        };
        var bins = new Option<int>("--bins") { HelpName = "N", Description = "Equal-probability bins per continuous feature.", DefaultValueFactory = _ => 20 };
        var core = new Option<double>("--core") { HelpName = "FRACTION", Description = "Central fraction of each continuous feature that takes the core tolerance.", DefaultValueFactory = _ => 0.90 };
        var categories = new Option<int>("--max-categories") { HelpName = "N", Description = "A whole-number column with at most this many distinct values is discrete (one category per value, no spike).", DefaultValueFactory = _ => DraftOptions.DefaultMaxCategories };
        var spikeShare = new Option<double>("--spike-share") { HelpName = "FRACTION", Description = "A value holding at least this share of a continuous column's events becomes a declared spike.", DefaultValueFactory = _ => 0.05 };
        var exclude = new Option<string[]>("--exclude")
        {
            Description = "Leave out the columns whose names match this glob (* any run, ? one character; repeatable). Nothing is left out by default; " +
                          $"columns named like generator-level truth ({string.Join(", ", GeneratorLevelNames.Globs)}) are flagged in the draft for review.",
            HelpName = "GLOB",
        };
        var weight = new Option<string?>("--weight") { HelpName = "COLUMN", Description = "Weight column of the trusted sample (also written as the contract's sample weight)." };
        var sample = new Option<string>("--sample-path") { HelpName = "PATH", Description = "The surrogate sample path written into the contract.", DefaultValueFactory = _ => "surrogate/*.parquet" }.NotEmpty();
        var reference = new Option<string?>("--reference-path") { HelpName = "PATH", Description = "The reference path written into the contract (default: reference/<trusted sample>-reference.parquet)." }.NotEmpty();
        var output = new Option<string>("--output", "-o") { HelpName = "FILE", Description = "Where to write the draft.", DefaultValueFactory = _ => Engine.Contracts.PrecisionContract.DefaultFileName }.NotEmpty();
        var force = new Option<bool>("--force") { Description = "Replace the output file if it exists." };
        var command = new Command("draft", "Draft a starter contract from a trusted sample: kinds inferred per column, tolerances derived from the analysis's expected data size and raised where a reference built from the same sample could not resolve them.")
        {
            from, dataEvents, coreShare, tailShare, bins, core, categories, spikeShare, exclude, weight, sample, reference, output, force,
        };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
        {
            var options = new DraftOptions(
                Positive(parse.GetValue(dataEvents), "--data-events"),
                Fraction(parse.GetValue(coreShare) ?? DraftOptions.DefaultCoreFraction, "--bias-fraction", allowAboveOne: true),
                Fraction(parse.GetValue(tailShare), "--tail-bias-fraction", allowAboveOne: true),
                (int)Positive(parse.GetValue(bins), "--bins"),
                Fraction(parse.GetValue(core), "--core", allowAboveOne: false),
                (int)Positive(parse.GetValue(categories), "--max-categories"),
                Fraction(parse.GetValue(spikeShare), "--spike-share", allowAboveOne: false));
            var target = Path.GetFullPath(parse.GetValue(output)!);
            if (File.Exists(target) && !parse.GetValue(force))
                throw new GateInputException(ErrorCodes.Usage, $"{target} exists; a draft never replaces a contract unless told to (--force).");
            var files = SampleFiles.Resolve(parse.GetValue(from)!, Directory.GetCurrentDirectory());
            new RunPaths().Read(files, "a trusted sample file").Write(target, "--output").Verify();
            var referencePath = parse.GetValue(reference) ?? $"reference/{Path.GetFileNameWithoutExtension(files[0])}-reference.parquet";
            var text = ContractDrafter.Draft(files, parse.GetValue(weight), options, parse.GetValue(sample)!, referencePath, ProgressDisplay.For(stdout, stderr),
                parse.GetValue(exclude) ?? []);
            AtomicFile.WriteText(target, text);
            stdout.WriteLine($"Draft written: {target}");
            stdout.WriteLine("Next: build its reference (gatetasks reference build), plan the surrogate sample size (gatetasks plan), review every value.");
            return ExitCodes.Success;
        }));
        return command;
    }

    private static long Positive(long value, string option) =>
        value > 0 ? value : throw new GateInputException(ErrorCodes.Usage, $"{option} must be a positive whole number, got {value}.");

    private static double Fraction(double value, string option, bool allowAboveOne) =>
        value > 0 && (allowAboveOne ? double.IsFinite(value) : value < 1) ? value
            : throw new GateInputException(ErrorCodes.Usage, $"{option} must be {(allowAboveOne ? "a positive number" : "between 0 and 1")}, got {value}.");
}
