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
    /// <summary>Seed of the sample's joint subsample.</summary>
    private const int SampleJointSeed = 7_654_321;

    /// <summary>Runs the contract. <paramref name="samplePath"/> overrides the contract's sample (relative to the working directory).</summary>
    public static CheckReport Run(PrecisionContract contract, string? samplePath = null, IProgress<ReadProgress>? progress = null)
    {
        var started = DateTimeOffset.UtcNow;
        var clock = Stopwatch.StartNew();
        // The sample's columns are checked first: a misspelt column is best answered with the sample's own names.
        var files = ContractInputs.SampleFiles(contract, samplePath);
        var sample = Sample.Open(files);
        sample.Progress = progress;
        sample.Phase = "checking the sample";
        ValidateColumns(contract, sample);
        var inputs = FeatureInputs.Compile(contract, sample.Columns.Select(c => c.Name).ToList());

        var referencePath = contract.ReferenceFullPath;
        var reference = ReferenceFile.Read(referencePath, contract.ReferenceLocation);
        var referenceSha = FileDigest.Sha256(referencePath);
        var references = contract.Features.Select(f => MatchReference(reference, f, referencePath)).ToList();
        var cores = contract.Features.Select((f, i) => RegionBins.Core(references[i], f)).ToList();

        // Each batch fills a plain histogram, then is added exactly, so the cells do not depend on the batching.
        var batchHistograms = references.Select(r => new Histogram(r.Histogram.Axis)).ToArray();
        var exact = references.Select(r => new ExactHistogram(r.Histogram.Axis)).ToArray();
        var stats = contract.Features.Select(_ => new FeatureStatistics()).ToArray();
        var farTail = contract.Features.Select((f, i) => f.Checks.Any(c => c.Kind == CheckKind.FarTail) && references[i].FarTail is { } t
            ? new FarTailCounter(t.Low, t.High) : null).ToArray();
        var index = contract.Features.Select((f, i) => (f.Name, i)).ToDictionary(p => p.Name, p => p.i);
        var joint = contract.Joint is { } js ? new JointSubsample(js.Features.Select(f => index[f]).ToList(), js.Subsample, SampleJointSeed) : null;
        var pairs = contract.Pairs.Select(p => new PairCorrelation(p, index[p.First], index[p.Second],
            new MarginalCdf(references[index[p.First]].Histogram), new MarginalCdf(references[index[p.Second]].Histogram),
            p.Chi2 is null ? null : new Histogram2D(references[index[p.First]].Histogram.Axis, references[index[p.Second]].Histogram.Axis))).ToList();
        var totals = SampleStream.Run(sample, inputs, contract.Sample.Weight, (i, values, weights) =>
        {
            batchHistograms[i].Fill(values, weights);
            exact[i].Absorb(batchHistograms[i]);
            stats[i].Add(values, weights);
            farTail[i]?.Add(values, weights);
        }, view =>
        {
            foreach (var p in pairs) p.Add(view);
            joint?.Add(view);
        });
        if (totals.Events == 0)
            throw new GateInputException(ErrorCodes.SampleEmpty,
                $"The surrogate sample has no events ({string.Join(", ", files.Select(Path.GetFileName))}).", contract.Sample.PathLocation);

        var histograms = exact.Select(h => h.ToHistogram()).ToArray();
        var measured = new List<(FeatureSpec, CheckSpec, Measurement)>();
        var comparisons = new List<FeatureComparison>();
        for (var i = 0; i < contract.Features.Count; i++)
        {
            var comparison = new FeatureComparison(contract.Features[i], references[i], histograms[i], stats[i].Summary(), cores[i], totals.Spikes[i], farTail[i]?.Counts);
            comparisons.Add(comparison);
            foreach (var check in contract.Features[i].Checks)
                measured.Add((contract.Features[i], check, CheckEvaluator.Measure(comparison, check, contract.Decision)));
        }
        foreach (var pair in pairs)
        {
            var stored = reference.FindPair(pair.Spec.First, pair.Spec.Second)
                ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                    $"The reference holds no correlation for {pair.Spec.Name}; rebuild it with 'gatetasks reference build'.", pair.Spec.Location);
            var first = contract.Features[index[pair.Spec.First]];
            // Pair checks are reported like a feature named after the pair, at the pair's entry in the contract.
            var subject = first with { Name = pair.Spec.Name, Column = pair.Spec.Name, Checks = [], Location = pair.Spec.Location, ColumnLocation = pair.Spec.Location };
            foreach (var check in new[] { pair.Spec.Pearson, pair.Spec.Spearman })
                if (check is not null) measured.Add((subject, check, CorrelationCheck.Evaluate(stored, pair, check, contract.Decision, totals.Events)));
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
            var first = contract.Features[index[jointSpec.Features[0]]];
            var subject = first with { Name = jointSpec.Name, Column = jointSpec.Name, Checks = [], Location = jointSpec.Location, ColumnLocation = jointSpec.Location };
            var permutations = jointSpec.PermutationsFor(measured.Count + 1, contract.Decision.FalseAlarm);
            measured.Add((subject, jointSpec.Test, JointCheck.Evaluate(stored.Rows.ToArray(), joint!.Rows, jointSpec, permutations)));
        }
        var outcomes = VerdictRule.Decide(measured, contract.Decision);

        return new CheckReport(contract, referencePath, referenceSha, reference, files, totals.Events, totals.SumW, totals.SumW2, outcomes, started, clock.Elapsed)
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
            var where = r.Column != feature.Column ? feature.ColumnLocation
                : r.Kind != feature.Kind ? feature.Location
                : feature.Binning.Location;
            throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference for feature '{feature.Name}' was built with other settings (column '{r.Column}', {r.Kind.ToString().ToLowerInvariant()}, binning {r.BinningRequest}); " +
                $"the contract asks for column '{feature.Column}', {feature.Kind.ToString().ToLowerInvariant()}, binning {feature.ReferenceRequest}. " +
                "Rebuild it with 'gatetasks reference build'.", where);
        }
        return r;
    }

    private static void ValidateColumns(PrecisionContract contract, Sample sample)
    {
        var available = sample.Columns.Select(c => c.Name).ToList();
        foreach (var f in contract.Features)
        {
            if (f.Expression is not null) continue; // its columns are checked when it is compiled
            if (!available.Contains(f.Column))
                throw new GateInputException(ErrorCodes.ContractUnknownColumn,
                    $"Feature '{f.Name}' reads column '{f.Column}', which the sample {Path.GetFileName(sample.Files[0])} does not have{NearestName.Hint(f.Column, available)}.",
                    f.ColumnLocation);
        }
        if (contract.Sample.Weight is { } w && !available.Contains(w))
            throw new GateInputException(ErrorCodes.ContractUnknownColumn,
                $"The weight column '{w}' is not in the sample {Path.GetFileName(sample.Files[0])}{NearestName.Hint(w, available)}.",
                contract.Sample.WeightLocation);
    }
}
