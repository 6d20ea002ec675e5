using System.Diagnostics;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.IO;
using GateTasks.Engine.References;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Checks a surrogate sample against a contract's reference: validates that contract, reference and sample
/// fit together, streams the sample once (batch by batch) into histograms with the reference's binning,
/// and evaluates every check.
/// </summary>
internal static class ContractCheck
{
    /// <summary>
    /// Runs the contract. <paramref name="samplePath"/> overrides the contract's sample (relative to the working
    /// directory); <paramref name="parallelism"/> bounds the threads (default: the processor count), which changes
    /// the time, never the results.
    /// </summary>
    public static CheckReport Run(PrecisionContract contract, string? samplePath = null, IProgress<ReadProgress>? progress = null, int? parallelism = null)
    {
        var started = DateTimeOffset.UtcNow;
        var clock = Stopwatch.StartNew();
        var files = ContractInputs.SampleFiles(contract, samplePath);
        // The sample's columns are checked before the reference is read: a misspelt column is best answered with the sample's own names.
        var sample = OpenSample(contract, files, progress);
        if (parallelism is { } threads) sample.Sample.Parallelism = Math.Max(1, threads);
        var setup = Prepare(contract);
        var accumulation = Accumulate(setup, sample);
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
    public static CheckReport RunFromPartials(PrecisionContract contract, IReadOnlyList<string> partials)
    {
        var started = DateTimeOffset.UtcNow;
        var clock = Stopwatch.StartNew();
        var setup = Prepare(contract);
        var (accumulation, provenance) = Partials.PartialFile.ReadMerged(partials, setup);
        if (accumulation.Events == 0)
            throw new GateInputException(ErrorCodes.SampleEmpty, $"The partial files hold no events ({string.Join(", ", partials.Select(Path.GetFileName))}).", new SourceLocation(partials[0]));
        RequireNormalisable(contract, accumulation, "surrogate sample in the partial files", partials);
        return Decide(setup, accumulation, provenance.SampleFiles.Select(f => f.Path).ToList(), started, clock);
    }

    // All-zero weights, or negatives that outweigh the positives, leave nothing to normalise: an input error (GATE2010)
    // at the contract's weight line, not a drift of every check.
    private static void RequireNormalisable(PrecisionContract contract, SampleAccumulation accumulation, string what, IReadOnlyList<string> files)
    {
        if (contract.Sample.Weight is not { } weight) return;
        SampleWeights.RequireNormalisable(accumulation.SumW, accumulation.SumW2, accumulation.Events, weight, what, files,
            contract.Sample.WeightLocation ?? contract.Sample.PathLocation);
    }

    /// <summary>Gathers one shard of the sample into a partial file, for merging elsewhere.</summary>
    public static long Fill(PrecisionContract contract, string samplePath, string output, IProgress<ReadProgress>? progress = null)
    {
        var files = ContractInputs.SampleFiles(contract, samplePath);
        var opened = OpenSample(contract, files, progress);
        var setup = Prepare(contract);
        var accumulation = Accumulate(setup, opened);
        // Each file is recorded by the digest of its content (its identity when partials are merged) and its path (for messages).
        var counted = opened.Sample.Shards.Select(s => new Partials.PartialFile.CountedFile(s.Path, s.Xxh128)).ToList();
        Partials.PartialFile.Write(output, setup, accumulation, new Partials.PartialFile.Provenance(counted, []));
        return accumulation.Events;
    }

    /// <summary>Merges partial files into one (exact sums stay exact), recording each input's SHA-256.</summary>
    public static long Merge(PrecisionContract contract, IReadOnlyList<string> partials, string output)
    {
        var setup = Prepare(contract);
        var (accumulation, provenance) = Partials.PartialFile.ReadMerged(partials, setup);
        Partials.PartialFile.Write(output, setup, accumulation, provenance);
        return accumulation.Events;
    }

    /// <summary>The reference a contract is checked against, read and matched to its features once.</summary>
    internal sealed record CheckSetup(PrecisionContract Contract, ReferenceHistograms Reference, string ReferencePath, string ReferenceSha256,
        IReadOnlyList<ReferenceFeature> References);

    /// <summary>Reads the contract's reference and matches every feature to it.</summary>
    internal static CheckSetup Prepare(PrecisionContract contract)
    {
        var referencePath = contract.ReferenceFullPath;
        var reference = ReferenceFile.Read(referencePath, contract.ReferenceLocation);
        var references = contract.Features.Select(f => MatchReference(reference, f, referencePath)).ToList();
        // Again at check: a reference built before this rule, or a contract's regions changed since, is caught here.
        for (var i = 0; i < references.Count; i++) BinCoverage.Verify(contract.Features[i], references[i]);
        return new CheckSetup(contract, reference, referencePath, FileDigest.Sha256(referencePath), references);
    }

    /// <summary>A sample opened for a contract: its files' schemas read, its columns checked, the expressions compiled.</summary>
    internal sealed record OpenedSample(Sample Sample, FeatureInputs Inputs);

    /// <summary>Opens a sample and checks it against the contract (columns, then expressions) before anything is read.</summary>
    internal static OpenedSample OpenSample(PrecisionContract contract, IReadOnlyList<string> files, IProgress<ReadProgress>? progress = null)
    {
        var sample = Sample.Open(files);
        sample.Progress = progress;
        sample.Phase = "checking the sample";
        ValidateColumns(contract, sample);
        return new OpenedSample(sample, FeatureInputs.Compile(contract, sample.ColumnNamesInAnyFile));
    }

    /// <summary>Streams one sample (or one shard of it) into a new accumulation.</summary>
    internal static SampleAccumulation Accumulate(CheckSetup setup, OpenedSample opened)
    {
        var accumulation = new SampleAccumulation(setup.Contract, setup.References);
        accumulation.Read(opened.Sample, opened.Inputs);
        return accumulation;
    }

    /// <summary>Evaluates every check on what was gathered from the sample (in one pass, or merged from shards).</summary>
    internal static CheckReport Decide(CheckSetup setup, SampleAccumulation accumulation, IReadOnlyList<string> files, DateTimeOffset started, Stopwatch clock)
    {
        var (contract, reference, referencePath, referenceSha, references) = (setup.Contract, setup.Reference, setup.ReferencePath, setup.ReferenceSha256, setup.References);
        NonFiniteGuard.Verify(contract, accumulation);
        var cores = contract.Features.Select((f, i) => RegionBins.Core(references[i], f)).ToList();
        var pairs = accumulation.Pairs;
        var joint = accumulation.Joint;
        // Features are measured side by side (each reads only its own histogram and summary, and every bootstrap has
        // its own seed), then gathered in contract order: the same measurements whatever the thread count.
        var n = contract.Features.Count;
        var comparisonOf = new FeatureComparison[n];
        var measuredOf = new (CheckSubject, CheckSpec, Measurement)[n][];
        var failures = new Exception?[n];
        Parallel.For(0, n, i =>
        {
            try
            {
                var comparison = new FeatureComparison(contract.Features[i], references[i], accumulation.Histogram(i), accumulation.Summary(i), cores[i],
                    accumulation.Spike(i), accumulation.FarTail(i));
                comparisonOf[i] = comparison;
                var feature = new FeatureSubject(contract.Features[i]);
                measuredOf[i] = contract.Features[i].Checks.Select(check => ((CheckSubject)feature, check, CheckEvaluator.Measure(comparison, check, contract.Decision))).ToArray();
            }
            catch (Exception e)
            {
                failures[i] = e;
            }
        });
        if (Array.Find(failures, f => f is not null) is { } failure) System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(failure);
        var comparisons = comparisonOf.ToList();
        var measured = measuredOf.SelectMany(m => m).ToList();
        foreach (var pair in pairs)
        {
            var stored = reference.FindPair(pair.Spec.First, pair.Spec.Second)
                ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                    $"The reference holds no correlation for {pair.Spec.Name}; rebuild it with 'gatetasks reference build'.", pair.Spec.Location);
            var subject = new PairSubject(pair.Spec);
            foreach (var check in new[] { pair.Spec.Pearson, pair.Spec.Spearman })
                if (check is not null) measured.Add((subject, check, CorrelationCheck.Evaluate(stored, pair, check, contract.Decision, accumulation.Events)));
            if (pair.Spec.Chi2 is { } chi2)
            {
                if (stored.Cells2DSumW is null || stored.Cells2DSumW2 is null || pair.JointCells is not { } cells || stored.Cells2DSumW.Length != cells.SumW.Length)
                    throw new GateInputException(ErrorCodes.ReferenceMismatch,
                        $"The reference holds no 2-D histogram for {pair.Spec.Name} on these axes; rebuild it with 'gatetasks reference build'.", pair.Spec.Location);
                measured.Add((subject, chi2, ChiSquareCheck.Evaluate(
                    new CellContents(stored.Cells2DSumW, stored.Cells2DSumW2),
                    new CellContents(cells.SumW, cells.SumW2))));
            }
        }
        if (contract.Joint is { } jointSpec)
        {
            var stored = reference.Joint is { } rj && rj.Features.SequenceEqual(jointSpec.Features)
                ? rj
                : throw new GateInputException(ErrorCodes.ReferenceMismatch,
                    $"The reference holds no subsample of {jointSpec.Name}; rebuild it with 'gatetasks reference build'.", jointSpec.Location);
            var subject = new JointSubject(jointSpec);
            var permutations = jointSpec.PermutationsFor(measured.Count + 1, contract.Decision.FalseAlarm);
            measured.Add((subject, jointSpec.Test, JointCheck.Evaluate(stored.Rows.ToArray(), joint!.Rows, jointSpec, permutations)));
        }
        var outcomes = VerdictRule.Decide(measured, contract.Decision);

        return new CheckReport(contract, referencePath, referenceSha, reference, files, accumulation.Events, accumulation.SumW, accumulation.SumW2, outcomes, started, clock.Elapsed)
        {
            Comparisons = comparisons,
            Acceptance = Ledger.LedgerGuard.Verify(contract, referenceSha, outcomes),
        };
    }

    private static ReferenceFeature MatchReference(ReferenceHistograms reference, FeatureSpec feature, string referencePath)
    {
        var r = reference.Find(feature.Name)
            ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference {Path.GetFileName(referencePath)} has no feature '{feature.Name}'{NearestName.Hint(feature.Name, reference.Features.Select(f => f.Name))}; " +
                "rebuild it with 'gatetasks reference build'.", feature.Location);
        if (r.Column != feature.Column || r.Kind != feature.Kind || r.BinningRequest != feature.ReferenceRequest)
        {
            // Said where the changed part of the definition is written: a feature's expression at the feature, not at
            // the binning (which may be the defaults').
            var (what, where) = r.Column != feature.Column ? ("column", feature.ColumnLocation)
                : r.Kind != feature.Kind ? ("kind", feature.Location)
                : ChangedPart(r.BinningRequest, feature);
            throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference for feature '{feature.Name}' was built with another {what} (column '{r.Column}', {r.Kind.ToString().ToLowerInvariant()}, binning {r.BinningRequest}); " +
                $"the contract asks for column '{feature.Column}', {feature.Kind.ToString().ToLowerInvariant()}, binning {feature.ReferenceRequest}. " +
                "Rebuild it with 'gatetasks reference build'.", where);
        }
        return r;
    }

    /// <summary>Which part of a feature's reference request (<see cref="FeatureSpec.ReferenceRequest"/>) differs from the stored one, and where the contract writes it.</summary>
    private static (string What, SourceLocation Where) ChangedPart(string stored, FeatureSpec feature)
    {
        static string Part(string request, string marker)
        {
            var at = request.IndexOf(marker, StringComparison.Ordinal);
            if (at < 0) return "";
            var end = new[] { "|spike:", "|expression:", "|condition:" }.Select(m => request.IndexOf(m, at + marker.Length, StringComparison.Ordinal))
                .Where(i => i > at).DefaultIfEmpty(request.Length).Min();
            return request[at..end];
        }
        var wanted = feature.ReferenceRequest;
        if (Part(stored, "|expression:") != Part(wanted, "|expression:")) return ("expression", feature.ColumnLocation);
        if (Part(stored, "|condition:") != Part(wanted, "|condition:")) return ("condition", feature.Condition?.Location ?? feature.Location);
        if (Part(stored, "|spike:") != Part(wanted, "|spike:")) return ("spike", feature.Location);
        return ("binning", feature.Binning.Location);
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
