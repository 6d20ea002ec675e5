using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// Measures a contract's decisions by simulation. Each replica draws, for every feature, a fresh reference (of the
/// reference's effective size) and a surrogate sample of the given size from the reference histogram taken as the
/// truth — distorted by a drift for one feature — and runs every check and the contract-wide decision on them.
/// Null replicas give the false-alarm rate, which must not exceed the contract's level; drifted ones the
/// detection rate. Seeds are fixed per replica, so results do not depend on the thread count.
/// </summary>
internal static class CalibrationStudy
{
    public static CalibrationResult Run(PrecisionContract contract, ReferenceHistograms reference, Drift drift, string? driftFeature,
        long events, int replicas, int seed)
    {
        var features = contract.Features.Select(f =>
        {
            var r = reference.Find(f.Name) ?? throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference has no feature '{f.Name}'; rebuild it with 'gatetasks reference build'.", f.Location);
            return (Spec: f, Reference: r, Core: (IReadOnlyList<bool>)RegionBins.Core(r, f));
        }).ToList();

        var target = drift.Kind == DriftKind.None ? null : driftFeature ?? DefaultFeature(contract, drift);
        if (target is not null && features.All(f => f.Spec.Name != target))
            throw new GateInputException(ErrorCodes.Usage, $"No feature '{target}' in the contract to drift{NearestName.Hint(target, features.Select(f => f.Spec.Name))}.");

        var truth = features.Select(f => DriftedDistribution.CellProbabilities(f.Reference, f.Core, Drift.Null)).ToList();
        var drifted = features.Select((f, i) => f.Spec.Name == target ? DriftedDistribution.CellProbabilities(f.Reference, f.Core, drift) : truth[i]).ToList();
        var referenceEvents = (long)Math.Round(reference.EffectiveEvents);

        var failed = 0;
        var inconclusive = 0;
        Parallel.For(0, replicas, () => (Failed: 0, Inconclusive: 0), (r, _, local) =>
        {
            var rng = new Xoshiro256StarStar(unchecked(seed * 1_000_003 + r), threadSafe: false);
            var measured = new List<(FeatureSpec, CheckSpec, Measurement)>();
            for (var i = 0; i < features.Count; i++)
            {
                var (spec, refFeature, core) = features[i];
                var axis = refFeature.Histogram.Axis;
                // A declared spike is split off before filling, as in a real check: its count first, the rest binned.
                var (refSpike, refBinned) = DrawSpike(refFeature, referenceEvents, rng);
                var (sampleSpike, sampleBinned) = DrawSpike(refFeature, events, rng);
                var refHistogram = ReplicaSampler.Draw(axis, truth[i], refBinned, rng);
                var sample = ReplicaSampler.Draw(axis, drifted[i], sampleBinned, rng);
                // Moments of both replicas come from their bins alike, so binning cannot bias their comparison.
                var refSummary = BinnedSummary.Of(refHistogram);
                var refReplica = refFeature with
                {
                    Histogram = refHistogram, Summary = refSummary, Spike = refSpike, FarTail = DrawFarTail(refFeature, refBinned, rng),
                };
                var sampleSummary = BinnedSummary.Of(sample);
                var comparison = new FeatureComparison(spec, refReplica, sample, sampleSummary, core, sampleSpike, DrawFarTail(refFeature, sampleBinned, rng));
                foreach (var check in spec.Checks) measured.Add((spec, check, CheckEvaluator.Measure(comparison, check, contract.Decision)));
            }
            var outcomes = VerdictRule.Decide(measured, contract.Decision);
            if (outcomes.Any(o => o.Verdict == Verdict.Fail)) local.Failed++;
            else if (outcomes.Any(o => o.Verdict == Verdict.Inconclusive)) local.Inconclusive++;
            return local;
        }, local =>
        {
            Interlocked.Add(ref failed, local.Failed);
            Interlocked.Add(ref inconclusive, local.Inconclusive);
        });
        return new CalibrationResult(drift, target, events, replicas, failed, inconclusive);
    }

    /// <summary>The spike tally of a replica of n events (binomial at the reference's spike fraction) and the events left to bin.</summary>
    private static (SpikeTally? Spike, long Binned) DrawSpike(ReferenceFeature f, long n, Random rng)
    {
        if (f.Spike is not { } spike) return (null, n);
        var fraction = spike.SumW / (spike.SumW + f.Histogram.TotalSumW);
        var k = ReplicaSampler.Binomial(rng, fraction, n);
        return (new SpikeTally(spike.Value, k, k, k), n - k);
    }

    /// <summary>
    /// Far-tail counts of a replica of n events: a multinomial draw (below, above, the rest) at the reference's
    /// fractions. Drawn apart from the histogram, so a drift of the histogram does not reach them.
    /// </summary>
    private static FarTailCounts? DrawFarTail(ReferenceFeature f, long n, Random rng)
    {
        if (f.FarTail is not { } t || !(t.TotalW > 0)) return null;
        var pBelow = t.BelowW / t.TotalW;
        var below = ReplicaSampler.Binomial(rng, pBelow, n);
        var above = pBelow < 1 ? ReplicaSampler.Binomial(rng, Math.Min(1, t.AboveW / t.TotalW / (1 - pBelow)), n - below) : 0;
        return t with { BelowW = below, BelowW2 = below, AboveW = above, AboveW2 = above, TotalW = n, TotalW2 = n };
    }

    /// <summary>
    /// For a spike-fraction drift the discrete feature with the most checks (a category block's fraction feature,
    /// with one, comes last), the first continuous one otherwise.
    /// </summary>
    public static string? DefaultFeature(PrecisionContract contract, Drift drift)
    {
        if (drift.Kind == DriftKind.SpikeFraction)
            return contract.Features.Where(f => f.Kind == FeatureKind.Discrete).OrderByDescending(f => f.Checks.Count).FirstOrDefault()?.Name;
        return contract.Features.FirstOrDefault(f => f.Kind == FeatureKind.Continuous)?.Name;
    }
}
