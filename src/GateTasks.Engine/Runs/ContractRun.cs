using System.Diagnostics;
using GateTasks.Engine.Samples;
using GateTasks.Engine.References;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Runs;

/// <summary>
/// Checks a surrogate sample against a contract's reference: validates that contract, reference and sample
/// fit together, streams the sample once (batch by batch) into histograms with the reference's binning,
/// and evaluates every check.
/// </summary>
internal static class ContractRun
{
    /// <summary>
    /// Runs the contract. <paramref name="samplePath"/> overrides the contract's sample (relative to the working
    /// directory); <paramref name="parallelism"/> bounds the threads (default: the processor count), which changes
    /// the time, never the results.
    /// </summary>
    public static RunResult Run(PrecisionContract contract, string? samplePath = null, IProgress<ReadProgress>? progress = null, int? parallelism = null)
    {
        var started = DateTimeOffset.UtcNow;
        var clock = Stopwatch.StartNew();
        var files = ContractInputs.SampleFiles(contract, samplePath);
        // The sample's columns are checked before the reference is read: a misspelt column is best answered with the sample's own names.
        var sample = OpenSample(contract, files, new ReadPass("checking the sample", progress, parallelism));
        var setup = MatchedReference.Load(contract);
        var accumulation = Accumulate(setup, sample).Finish();
        if (accumulation.Events == 0 && contract.Selection is { } selection && sample.Sample.RowsRead > 0)
            throw new GateInputException(ErrorCodes.SampleEmpty,
                $"The selection '{selection.Text}' keeps none of the {InvariantNumber.Count(sample.Sample.RowsRead)} events of the surrogate sample " +
                $"({string.Join(", ", files.Select(Path.GetFileName))}).", selection.Location);
        if (accumulation.Events == 0)
            throw new GateInputException(ErrorCodes.SampleEmpty,
                $"The surrogate sample has no events ({string.Join(", ", files.Select(Path.GetFileName))}).", contract.Sample.PathLocation);
        RequireNormalisable(contract, accumulation, "surrogate sample", files);
        return Decide(setup, accumulation, files, started, clock);
    }

    /// <summary>
    /// Decides from partial files (from 'gatetasks fill' on shards of the sample, or 'gatetasks merge'): they are merged,
    /// then every check runs as on one pass over the whole sample.
    /// </summary>
    public static RunResult RunFromPartials(PrecisionContract contract, IReadOnlyList<string> partials)
    {
        var started = DateTimeOffset.UtcNow;
        var clock = Stopwatch.StartNew();
        var setup = MatchedReference.Load(contract);
        var (merged, provenance) = Partials.PartialFile.ReadMerged(partials, setup);
        var accumulation = merged.Finish();
        if (accumulation.Events == 0)
            throw new GateInputException(ErrorCodes.SampleEmpty, $"The partial files hold no events ({string.Join(", ", partials.Select(Path.GetFileName))}).", new SourceLocation(partials[0]));
        RequireNormalisable(contract, accumulation, "surrogate sample in the partial files", partials);
        return Decide(setup, accumulation, provenance.SampleFiles.Select(f => f.Path).ToList(), started, clock);
    }

    // All-zero weights, or negatives that outweigh the positives, leave nothing to normalise: an input error (GATE2010)
    // at the contract's weight line, not a drift of every check.
    private static void RequireNormalisable(PrecisionContract contract, AccumulatedSample accumulation, string what, IReadOnlyList<string> files)
    {
        if (contract.Sample.Weight is not { } weight) return;
        SampleWeights.RequireNormalisable(accumulation.SumW, accumulation.SumW2, accumulation.Events, weight, what, files,
            contract.Sample.WeightLocation ?? contract.Sample.PathLocation);
    }

    /// <summary>Gathers one shard of the sample into a partial file, for merging elsewhere.</summary>
    public static long Fill(PrecisionContract contract, string samplePath, string output, IProgress<ReadProgress>? progress = null)
    {
        var files = ContractInputs.SampleFiles(contract, samplePath);
        var opened = OpenSample(contract, files, new ReadPass("checking the sample", progress));
        var setup = MatchedReference.Load(contract);
        var accumulation = Accumulate(setup, opened);
        // Each file is recorded by the digest of its content (its identity when partials are merged) and its path (for messages).
        var counted = opened.Sample.Shards.Select(s => new Partials.PartialFile.CountedFile(s.Path, s.Xxh128)).ToList();
        Partials.PartialFile.Write(output, setup, accumulation, new Partials.PartialFile.Provenance(counted, []));
        return accumulation.Events;
    }

    /// <summary>Merges partial files into one (exact sums stay exact), recording each input's SHA-256.</summary>
    public static long Merge(PrecisionContract contract, IReadOnlyList<string> partials, string output)
    {
        var setup = MatchedReference.Load(contract);
        var (accumulation, provenance) = Partials.PartialFile.ReadMerged(partials, setup);
        Partials.PartialFile.Write(output, setup, accumulation, provenance);
        return accumulation.Events;
    }

    /// <summary>A sample opened for a contract: its files' schemas read, its columns checked, the expressions compiled; how it is to be read.</summary>
    internal sealed record OpenedSample(Sample Sample, FeatureSources Inputs, ReadPass Pass);

    /// <summary>Opens a sample and checks it against the contract (columns, then expressions) before anything is read.</summary>
    internal static OpenedSample OpenSample(PrecisionContract contract, IReadOnlyList<string> files, ReadPass? pass = null)
    {
        var sample = Sample.Open(files);
        ValidateColumns(contract, sample);
        return new OpenedSample(sample, FeatureSources.Compile(contract, sample.ColumnNamesInAnyFile), pass ?? new ReadPass("checking the sample"));
    }

    /// <summary>Streams one sample (or one shard of it) into a new accumulation.</summary>
    internal static SampleAccumulation Accumulate(MatchedReference setup, OpenedSample opened)
    {
        var accumulation = new SampleAccumulation(setup.Contract, setup.Layouts, setup.JointStandardisation, setup.SlicedGrid);
        accumulation.Read(opened.Sample, opened.Inputs, opened.Pass);
        return accumulation;
    }

    /// <summary>Evaluates every check on what was gathered from the sample (in one pass, or merged from shards), then the ledger.</summary>
    internal static RunResult Decide(MatchedReference setup, AccumulatedSample accumulation, IReadOnlyList<string> files, DateTimeOffset started, Stopwatch clock)
    {
        var evaluated = ContractEvaluation.Evaluate(setup, accumulation);
        return new RunResult(setup.Contract, setup.ReferencePath, setup.ReferenceSha256, setup.Reference, files, accumulation.Events, accumulation.SumW,
            accumulation.SumW2, evaluated.Outcomes, started, clock.Elapsed)
        {
            Comparisons = evaluated.Comparisons,
            Pairs = accumulation.Pairs,
            Readings = evaluated.Readings,
            Score = evaluated.Score,
            Acceptance = Ledger.LedgerGuard.Verify(setup.Contract, setup.ReferenceSha256, evaluated.Outcomes),
            LedgerEntries = Ledger.AcceptedEntries.Read(setup.Contract),
        };
    }

    private static void ValidateColumns(PrecisionContract contract, Sample sample)
    {
        var available = sample.ColumnNamesInAnyFile;
        var where = sample.Files.Count == 1 ? $"the sample {Path.GetFileName(sample.Files[0])} does not have" : $"none of the sample's {sample.Files.Count} files has";
        foreach (var f in contract.Features)
        {
            if (f.Expression is not null) continue; // its columns are checked when it is compiled
            if (!available.Contains(f.Column))
                throw new GateInputException(ErrorCodes.ContractUnknownColumn,
                    $"Feature '{f.Name}' reads column '{f.Column}', which {where}{NearestName.Hint(f.Column, available)}.",
                    f.ColumnLocation);
        }
        if (contract.Sample.Weight is { } w && !available.Contains(w))
            throw new GateInputException(ErrorCodes.ContractUnknownColumn,
                $"The contract weighs events by column '{w}', which {where}{NearestName.Hint(w, available)}.",
                contract.Sample.WeightLocation);
    }
}
