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
        var features = ReplicaFeature.All(contract, reference);
        var target = drift.Kind == DriftKind.None ? null : driftFeature ?? DefaultFeature(contract, drift);
        if (target is not null && features.All(f => f.Spec.Name != target))
            throw new GateInputException(ErrorCodes.Usage, $"No feature '{target}' in the contract to drift{NearestName.Hint(target, features.Select(f => f.Spec.Name))}.");

        var drifts = features.Select(f => f.Spec.Name == target ? drift : Drift.Null).ToList();
        var probabilities = features.Select((f, i) => f.Probabilities(drifts[i])).ToList();

        var failed = 0;
        var inconclusive = 0;
        Parallel.For(0, replicas, () => (Failed: 0, Inconclusive: 0), (r, _, local) =>
        {
            var rng = new Xoshiro256StarStar(unchecked(seed * 1_000_003 + r), threadSafe: false);
            var measured = new List<(CheckSubject, CheckSpec, Measurement)>();
            for (var i = 0; i < features.Count; i++)
                measured.AddRange(features[i].Measure(probabilities[i], drifts[i], events, contract.Decision, rng));
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
