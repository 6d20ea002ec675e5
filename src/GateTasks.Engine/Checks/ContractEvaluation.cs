using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Decides every check of a contract from what was gathered from the sample (in one pass, or merged from shards) and
/// the matched reference: measures each feature's, pair's and joint block's checks, then applies the contract's
/// decision rule across its tolerance checks and reads its goodness-of-fit tests as a family of their own.
/// </summary>
internal static class ContractEvaluation
{
    public static EvaluatedChecks Evaluate(MatchedReference matched, AccumulatedSample sample)
    {
        var (contract, reference, references) = (matched.Contract, matched.Reference, matched.Features);
        NonFiniteGuard.Verify(contract, sample);
        var cores = contract.Features.Select((f, i) => RegionBins.Core(references[i], f)).ToList();
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
                var gathered = sample.Features[i];
                var comparison = new FeatureComparison(contract.Features[i], references[i], gathered.Histogram, gathered.Summary, cores[i],
                    gathered.Spike, gathered.FarTail, gathered.FineGrid);
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
        var measured = measuredOf.SelectMany(m => m).ToList();
        foreach (var pair in sample.Pairs)
        {
            var stored = reference.FindPair(pair.Spec.First, pair.Spec.Second)
                ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                    $"The reference holds no correlation for {pair.Spec.Name}; rebuild it with 'gatetasks reference build'.", pair.Spec.Location);
            var subject = new PairSubject(pair.Spec);
            foreach (var check in new[] { pair.Spec.Pearson, pair.Spec.Spearman })
                if (check is not null) measured.Add((subject, check, Guarded(check, () => CorrelationCheck.Evaluate(stored, pair, check, contract.Decision, sample.Events))));
            if (pair.Spec.Chi2 is { } chi2)
            {
                if (stored.Cells2DSumW is null || stored.Cells2DSumW2 is null || pair.Cells is not { } cells || stored.Cells2DSumW.Length != cells.SumW.Length)
                    throw new GateInputException(ErrorCodes.ReferenceMismatch,
                        $"The reference holds no 2-D histogram for {pair.Spec.Name} on these axes; rebuild it with 'gatetasks reference build'.", pair.Spec.Location);
                measured.Add((subject, chi2, Guarded(chi2, () => ChiSquareCheck.Evaluate(
                    new CellContents(stored.Cells2DSumW, stored.Cells2DSumW2),
                    new CellContents(cells.SumW, cells.SumW2)))));
            }
        }
        Lazy<FrechetEstimate>? frechetEstimate = null;
        if (contract.Joint is { Streams: true } streamed)
        {
            var stored = reference.JointMoments is { } rm && rm.Features.SequenceEqual(streamed.Features)
                ? AccumulatedJointMoments.From(streamed.Features.Count, rm.State)
                : throw new GateInputException(ErrorCodes.ReferenceMismatch,
                    $"The reference holds no streamed moments of {streamed.Name}; rebuild it with 'gatetasks reference build'.", streamed.Location);
            var gathered = sample.JointMoments ?? AccumulatedJointMoments.From(streamed.Features.Count, new JointMomentsState(0, 0, null, null));
            var subject = new JointSubject(streamed);
            // One extrapolation (about B³/2 distances) serves the check and the global score.
            if (stored.Moments is { } rm2 && gathered.Moments is { } sm2)
                frechetEstimate = new Lazy<FrechetEstimate>(() => FrechetExtrapolation.Of(rm2, sm2));
            if (streamed.Frechet is { } frechet)
                measured.Add((subject, frechet, FrechetCheck.Evaluate(stored, gathered, frechet, contract.Decision, sample.Events, frechetEstimate)));
            if (streamed.KernelDistance is { } kernel)
                measured.Add((subject, kernel, KernelDistanceCheck.Evaluate(stored, gathered, kernel, contract.Decision, sample.Events)));
        }
        if (contract.Joint is { Slices: true } slicedSpec)
        {
            var stored = reference.Sliced is { } rs && rs.Grid.Features.SequenceEqual(slicedSpec.Features)
                ? rs.Histograms
                : throw new GateInputException(ErrorCodes.ReferenceMismatch,
                    $"The reference holds no sliced histograms of {slicedSpec.Name}; rebuild it with 'gatetasks reference build'.", slicedSpec.Location);
            var subject = new JointSubject(slicedSpec);
            foreach (var (check, m) in SlicedCheck.Evaluate(slicedSpec, stored, sample.Sliced, contract.Decision, sample.Events))
                measured.Add((subject, check, m));
        }
        // The global score: information beside the verdict, from the same moments as the frechet-max check.
        var score = contract.Joint is { } scored
            ? GlobalScore.Of(scored, reference.JointMoments is { } km && km.Features.SequenceEqual(scored.Features) && km.State.Moments is not null
                ? AccumulatedJointMoments.From(scored.Features.Count, km.State) : null, sample.JointMoments, frechetEstimate)
            : GlobalScore.NoJointBlock;
        // Two families: the tolerance checks decide the run; the goodness-of-fit tests are read apart, beside it.
        var tolerances = measured.Where(m => m.Item2 is not GoodnessOfFitTest).ToList();
        var tests = measured.Where(m => m.Item2 is GoodnessOfFitTest).Select(m => (m.Item1, (GoodnessOfFitTest)m.Item2, m.Item3)).ToList();
        return new EvaluatedChecks(comparisonOf, VerdictRule.Decide(tolerances, contract.Decision, sample.Events))
        {
            Readings = TestReadingRule.Read(tests, contract.Decision),
            Score = score,
        };
    }

    /// <summary>
    /// A pair's measurement, or — where its kernels refuse the cells (a 2-D cell holding a negative sum of weights is no
    /// probability) — an uncomputable one, undecided with the reason, as <see cref="CheckEvaluator.Measure"/> does for features.
    /// </summary>
    private static Measurement Guarded(CheckSpec spec, Func<Measurement> measure)
    {
        try
        {
            return measure();
        }
        catch (ArgumentException e)
        {
            return Measurement.Impossible($"{spec.Key} on these cells: {e.Message} (negative event weights can leave cells a probability-based test cannot use)", []);
        }
    }
}
