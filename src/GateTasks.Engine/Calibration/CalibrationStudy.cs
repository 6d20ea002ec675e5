using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// Measures a contract's decisions by simulation. Each replica draws, for every feature, a fresh reference (of the
/// reference's effective size) and a surrogate sample of the given size from the reference histogram taken as the
/// truth — distorted by a drift for one feature — and, for every declared pair, both sides from its joint law
/// (<see cref="PairReplica"/>); the joint block's checks are not replicated (a reference keeps no rows to draw its law
/// from; tests/studies/joint_power_study.py measures them). The surrogate's events may carry signed
/// weights (<see cref="WeightLaw"/>). Every check is measured by its own code and the contract-wide decision
/// (<see cref="VerdictRule"/>) taken over all of them. Null replicas give the false-alarm rate, which must not exceed
/// the contract's level; drifted ones the detection rate. Seeds are fixed per replica, so results do not depend on
/// the thread count.
/// </summary>
internal static class CalibrationStudy
{
    public static CalibrationResult Run(PrecisionContract contract, ReferenceHistograms reference, Drift drift, string? driftFeature,
        long events, int replicas, int seed, WeightLaw? weights = null)
    {
        var law = weights ?? WeightLaw.Unit;
        var features = ReplicaFeature.All(contract, reference);
        var target = drift.Kind == DriftKind.None ? null : driftFeature ?? DefaultFeature(contract, drift);
        if (target is not null && features.All(f => f.Spec.Name != target))
            throw new GateInputException(ErrorCodes.Usage, $"No feature '{target}' in the contract to drift{NearestName.Hint(target, features.Select(f => f.Spec.Name))}.");
        var pairs = PairReplica.All(contract, reference, seed);
        var checks = features.SelectMany(f => f.Spec.Checks.Select(c => (f.Subject, Check: c)))
            .Concat(pairs.SelectMany(p => p.Spec.Checks.Select(c => (p.Subject, Check: c))))
            .ToList();

        var drifts = features.Select(f => f.Spec.Name == target ? drift : Drift.Null).ToList();
        var probabilities = features.Select((f, i) => f.Probabilities(drifts[i])).ToList();

        var failed = 0;
        var inconclusive = 0;
        var perCheck = new int[checks.Count, 3];
        Parallel.For(0, replicas, () => (Failed: 0, Inconclusive: 0, Checks: new int[checks.Count, 3]), (r, _, local) =>
        {
            var rng = new Xoshiro256StarStar(unchecked(seed * 1_000_003 + r), threadSafe: false);
            var measured = new List<(CheckSubject, CheckSpec, Measurement)>();
            for (var i = 0; i < features.Count; i++)
            {
                if (law.IsUnit)
                {
                    measured.AddRange(features[i].Measure(probabilities[i], drifts[i], events, contract.Decision, rng));
                    continue;
                }
                var comparison = law.Apply(features[i].Draw(probabilities[i], drifts[i], events, rng), rng);
                measured.AddRange(features[i].Spec.Checks.Select(check => (features[i].Subject, check, CheckEvaluator.Measure(comparison, check, contract.Decision))));
            }
            foreach (var pair in pairs) measured.AddRange(pair.Measure(events, law, contract.Decision, rng));
            var outcomes = VerdictRule.Decide(measured, contract.Decision);
            if (outcomes.Any(o => o.Verdict == Verdict.Fail)) local.Failed++;
            else if (outcomes.Any(o => o.Verdict == Verdict.Inconclusive)) local.Inconclusive++;
            for (var k = 0; k < outcomes.Count; k++)
            {
                if (outcomes[k].Verdict == Verdict.Fail) local.Checks[k, 0]++;
                if (outcomes[k].Verdict == Verdict.Inconclusive) local.Checks[k, 1]++;
                if (CheckTally.IsSignificant(outcomes[k], contract.Decision)) local.Checks[k, 2]++;
            }
            return local;
        }, local =>
        {
            lock (perCheck)
            {
                failed += local.Failed;
                inconclusive += local.Inconclusive;
                for (var k = 0; k < checks.Count; k++)
                    for (var j = 0; j < 3; j++) perCheck[k, j] += local.Checks[k, j];
            }
        });
        return new CalibrationResult(drift, target, events, replicas, failed, inconclusive)
        {
            Weights = law,
            Checks = checks.Select((c, k) => new CheckTally(c.Subject.Name, c.Check.Label, CheckTally.Tests(c.Check), replicas,
                perCheck[k, 0], perCheck[k, 1], perCheck[k, 2])).ToList(),
        };
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
