using GateTasks.Engine.Calibration;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.References;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Planning;

/// <summary>
/// Plans a surrogate sample's size by simulation with the checks' own measuring and decision code (the replicas of
/// <see cref="ReplicaFeature"/>, as calibration draws them: a fresh reference of the reference's effective size and a
/// surrogate, both from the reference histogram taken as the truth; a pair's coefficients by <see cref="CorrelationReplica"/>).
/// A check's verdict in a replica is decided over the whole contract's family, the other checks taken as perfect
/// (p-value 1), so the multiple-testing correction sees the contract's size. Goodness-of-fit tests are diagnostics,
/// outside that family: not planned. Sizes step by quarter octaves (×2^¼ ≈ 1.19), so a planned size is exact to that step.
/// Replicas use the same seeds at every size and drift (common random numbers), so rates change smoothly along a search.
/// </summary>
internal static class PlanStudy
{
    public const long SmallestEvents = 100;
    public const long LargestEvents = 10_000_000_000;
    private const int StepsPerDoubling = 4;

    /// <summary>The surrogate size at grid step k.</summary>
    public static long EventsAt(int k) => (long)Math.Round(SmallestEvents * Math.Pow(2, (double)k / StepsPerDoubling));

    private static readonly int LastStep = (int)Math.Ceiling(StepsPerDoubling * Math.Log2((double)LargestEvents / SmallestEvents));

    public static SampleSizePlan Run(PrecisionContract contract, ReferenceHistograms reference, long? detectionEvents, int replicas, int seed, double power = 0.95)
    {
        // Judged against the tolerances a check applies: a category's scaled with its share of the reference.
        contract = CategoryTolerances.Resolve(contract, reference);
        var features = ReplicaFeature.All(contract, reference);
        var pairs = CorrelationReplica.All(contract, reference);
        var target = contract.Decision.Confidence;
        var all = Family(features, pairs);

        // Passing: per feature, the smallest grid step at which each of its checks passes at the target rate.
        var passSteps = new int?[features.Count][];
        var passRates = new double[features.Count][];
        Parallel.For(0, features.Count, i =>
            (passSteps[i], passRates[i]) = PassSteps(features[i].Spec.Checks.Count, target,
                k => Rates(features[i], Drift.Null, EventsAt(k), all, contract.Decision, replicas, seed + i, Verdict.Pass)));

        // The same for each pair's coefficients.
        var pairSteps = new int?[pairs.Count][];
        var pairRates = new double[pairs.Count][];
        Parallel.For(0, pairs.Count, i =>
            (pairSteps[i], pairRates[i]) = PassSteps(pairs[i].Checks.Count, target,
                k => PairRates(pairs[i], 0, EventsAt(k), all, contract.Decision, replicas, seed + 104_729 * (i + 1), Verdict.Pass)));

        // The whole contract: from the largest of the checks' sizes up, every feature and pair drawn in each replica.
        int? contractStep = null;
        var contractRate = 0.0;
        var steps = passSteps.Select((s, i) => s.Where((_, j) => features[i].Spec.Checks[j] is not GoodnessOfFitTest)).SelectMany(s => s)
            .Concat(pairSteps.SelectMany(s => s)).ToList();
        if (steps.Count > 0 && steps.All(k => k is not null))
        {
            var start = steps.Max()!.Value;
            for (var k = start; k <= Math.Min(LastStep, start + 2 * StepsPerDoubling); k++)
            {
                contractRate = ContractPassRate(features, pairs, contract.Decision, EventsAt(k), replicas, seed);
                if (contractRate < target) continue;
                contractStep = k;
                break;
            }
        }

        // Detection: per check, the smallest drift of its family failed in at least `power` of the replicas.
        var nDetect = detectionEvents ?? (contractStep is { } cs ? EventsAt(cs) : 1_000_000);
        var planned = new PlannedCheck[features.Count][];
        Parallel.For(0, features.Count, i =>
        {
            var f = features[i];
            var cache = new Dictionary<(DriftKind, double), double[]>();
            planned[i] = new PlannedCheck[f.Spec.Checks.Count];
            for (var j = 0; j < f.Spec.Checks.Count; j++)
            {
                var check = f.Spec.Checks[j];
                var family = Family(f, check);
                double? size = null;
                var detection = double.NaN;
                double? effect = null;
                var largest = 0.0;
                if (family is { } kind)
                {
                    largest = LargestDrift(f, kind);
                    double[] At(double s) => cache.TryGetValue((kind, s), out var r) ? r
                        : cache[(kind, s)] = Rates(f, new Drift(kind, s, ""), nDetect, all, contract.Decision, replicas, seed + 7919 * (i + 1), Verdict.Fail);
                    size = SmallestDrift(s => At(s)[j] >= power, largest);
                    if (size is { } s)
                    {
                        detection = At(s)[j];
                        if (check is ToleranceCheck)
                        {
                            var drift = new Drift(kind, s, "");
                            effect = CheckEvaluator.Measure(f.Expected(f.Probabilities(drift), drift, nDetect), check, contract.Decision).Estimate;
                        }
                    }
                }
                var step = passSteps[i][j];
                planned[i][j] = new PlannedCheck(f.Subject, check, step is { } k ? EventsAt(k) : null, passRates[i][j],
                    Math.Sqrt(passRates[i][j] * (1 - passRates[i][j]) / replicas), family, size, detection, effect, largest);
            }
        });

        // Each pair's coefficients: the smallest change towards zero failed in at least `power` of the replicas.
        var plannedPairs = new PlannedCheck[pairs.Count][];
        Parallel.For(0, pairs.Count, i =>
        {
            var pair = pairs[i];
            var cache = new Dictionary<double, double[]>();
            double[] At(double s) => cache.TryGetValue(s, out var r) ? r
                : cache[s] = PairRates(pair, s, nDetect, all, contract.Decision, replicas, seed + 15_485_863 * (i + 1), Verdict.Fail);
            plannedPairs[i] = pair.Checks.Select((check, j) =>
            {
                var size = SmallestDrift(s => At(s)[j] >= power, CorrelationReplica.LargestDrift);
                var step = pairSteps[i][j];
                return new PlannedCheck(pair.Subject, check, step is { } k ? EventsAt(k) : null, pairRates[i][j],
                    Math.Sqrt(pairRates[i][j] * (1 - pairRates[i][j]) / replicas), DriftKind.CorrelationChange, size,
                    size is { } d ? At(d)[j] : double.NaN, size is { } e ? CorrelationReplica.Effect(e) : null, CorrelationReplica.LargestDrift);
            }).ToArray();
        });

        // Goodness-of-fit tests are read beside the verdict, never decide it: nothing to plan a size for.
        var notPlanned = features.SelectMany(f => f.Spec.Checks.OfType<GoodnessOfFitTest>().Select(t => $"{t.Label} of {f.Subject.Name}"))
            .Concat(contract.Pairs.Where(p => p.Chi2 is not null).Select(p => $"{p.Chi2!.Label} of {p.Name}")).ToList();
        // The joint block's checks are not replicated by the plan (its replicas draw each feature or pair on its own).
        if (contract.Joint is { } joint)
            notPlanned.AddRange(joint.Checks.Select(c => $"{c.Label} of {string.Join(", ", joint.Features)}"));
        var rows = planned.SelectMany(p => p).Where(c => c.Check is not GoodnessOfFitTest).Concat(plannedPairs.SelectMany(p => p)).ToList();
        return new SampleSizePlan(rows, contractStep is { } c ? EventsAt(c) : null, contractRate,
            Math.Sqrt(contractRate * (1 - contractRate) / replicas), nDetect, target, power, replicas,
            features.Count > 0 ? features[0].ReferenceEvents : 0, notPlanned);
    }

    /// <summary>
    /// The drift family a check is most sensitive to: a shift of the spike's share or the top category for
    /// fractions and discrete features, a deficit of the tails for the tails' bin ratios, a widening for widths, a
    /// scale shift otherwise. Null for far-tail fractions: their counts are drawn apart from the histogram.
    /// </summary>
    public static DriftKind? Family(ReplicaFeature f, CheckSpec check) => check.Kind switch
    {
        CheckKind.FarTail => null,
        CheckKind.Fraction => DriftKind.SpikeFraction,
        _ when f.Spec.Kind == FeatureKind.Discrete => DriftKind.SpikeFraction,
        CheckKind.BinRatio when check is RegionToleranceCheck { Region.Kind: Region.Tails } => DriftKind.TailDeficit,
        CheckKind.WidthRatio or CheckKind.InterquartileWidthRatio => DriftKind.Width,
        _ => DriftKind.Scale,
    };

    private static double LargestDrift(ReplicaFeature f, DriftKind kind) => kind switch
    {
        DriftKind.Scale => 0.5,
        DriftKind.Width => 1.0,
        DriftKind.TailDeficit => 0.99,
        // All of the spike's share (or the top category's) at the most.
        _ => f.Reference.Spike is not null ? f.SpikeShare
            : f.Reference.Histogram.SumW.ToArray().Max() / f.Reference.Histogram.TotalSumW,
    };

    /// <summary>Per check of the feature, the share of replicas whose verdict was <paramref name="counted"/>.</summary>
    private static double[] Rates(ReplicaFeature f, Drift drift, long events, IReadOnlyList<(object Owner, CheckSubject Subject, CheckSpec Check)> all,
        DecisionSettings decision, int replicas, int seed, Verdict counted)
    {
        var probabilities = f.Probabilities(drift);
        var others = Others(all, f.Spec);
        var hits = new int[f.Spec.Checks.Count];
        // Replicas in parallel too: one feature with a fine-grid check can outlast all the others. Each replica has its
        // own seed, so the counts do not depend on the thread count.
        Parallel.For(0, replicas, r =>
        {
            var rng = new Xoshiro256StarStar(unchecked(seed * 1_000_003 + r), threadSafe: false);
            var items = f.Measure(probabilities, drift, events, decision, rng).ToList();
            var count = items.Count;
            items.AddRange(others);
            var outcomes = VerdictRule.Decide(items, decision);
            for (var j = 0; j < count; j++)
                if (outcomes[j].Verdict == counted) Interlocked.Increment(ref hits[j]);
        });
        return hits.Select(h => (double)h / replicas).ToArray();
    }

    /// <summary>Per tolerance check of the pair, the share of replicas whose verdict was <paramref name="counted"/>.</summary>
    private static double[] PairRates(CorrelationReplica pair, double drift, long events, IReadOnlyList<(object Owner, CheckSubject Subject, CheckSpec Check)> all,
        DecisionSettings decision, int replicas, int seed, Verdict counted)
    {
        var others = Others(all, pair.Spec);
        var hits = new int[pair.Checks.Count];
        Parallel.For(0, replicas, r =>
        {
            var rng = new Xoshiro256StarStar(unchecked(seed * 1_000_003 + r), threadSafe: false);
            var items = pair.Measure(drift, events, decision, rng).ToList();
            var count = items.Count;
            items.AddRange(others);
            var outcomes = VerdictRule.Decide(items, decision);
            for (var j = 0; j < count; j++)
                if (outcomes[j].Verdict == counted) Interlocked.Increment(ref hits[j]);
        });
        return hits.Select(h => (double)h / replicas).ToArray();
    }

    /// <summary>Every tolerance check of the contract with what owns it (a feature's or a pair's spec).</summary>
    private static List<(object Owner, CheckSubject Subject, CheckSpec Check)> Family(IReadOnlyList<ReplicaFeature> features, IReadOnlyList<CorrelationReplica> pairs) =>
        features.SelectMany(f => f.Spec.Checks.Select(c => ((object)f.Spec, f.Subject, c)))
            .Concat(pairs.SelectMany(p => p.Checks.Select(c => ((object)p.Spec, p.Subject, (CheckSpec)c))))
            .ToList();

    /// <summary>The checks of the family not owned by <paramref name="owner"/>, taken as perfectly met.</summary>
    private static List<(CheckSubject, CheckSpec, Measurement)> Others(IReadOnlyList<(object Owner, CheckSubject Subject, CheckSpec Check)> all, object owner) =>
        all.Where(a => !ReferenceEquals(a.Owner, owner)).Select(a => Perfect(a.Subject, a.Check)).ToList();

    /// <summary>The share of replicas in which a perfect surrogate of <paramref name="events"/> events passes every check of the contract.</summary>
    public static double PassRate(PrecisionContract contract, ReferenceHistograms reference, long events, int replicas, int seed)
    {
        contract = CategoryTolerances.Resolve(contract, reference);
        return ContractPassRate(ReplicaFeature.All(contract, reference), CorrelationReplica.All(contract, reference), contract.Decision, events, replicas, seed);
    }

    /// <summary>A check taken as perfectly met: nothing to correct for, passing.</summary>
    private static (CheckSubject, CheckSpec, Measurement) Perfect(CheckSubject subject, CheckSpec check) =>
        (subject, check, new Measurement(0, 0, 0, 1, "", []));

    private static double ContractPassRate(IReadOnlyList<ReplicaFeature> features, IReadOnlyList<CorrelationReplica> pairs,
        DecisionSettings decision, long events, int replicas, int seed)
    {
        var passed = 0;
        var probabilities = features.Select(f => f.Probabilities(Drift.Null)).ToList();
        Parallel.For(0, replicas, r =>
        {
            var rng = new Xoshiro256StarStar(unchecked(seed * 1_000_003 + r), threadSafe: false);
            var items = features.SelectMany((f, i) => f.Measure(probabilities[i], Drift.Null, events, decision, rng))
                .Concat(pairs.SelectMany(p => p.Measure(0, events, decision, rng))).ToList();
            if (VerdictRule.Decide(items, decision).All(o => o.Verdict == Verdict.Pass)) Interlocked.Increment(ref passed);
        });
        return (double)passed / replicas;
    }

    /// <summary>
    /// Per check of one owner, the smallest grid step whose pass rate reaches <paramref name="target"/> (null: none up to
    /// the last step) and the rate there; <paramref name="rates"/> gives every check's rate at a step, each step simulated once.
    /// </summary>
    private static (int?[] Steps, double[] Rates) PassSteps(int checks, double target, Func<int, double[]> rates)
    {
        var cache = new Dictionary<int, double[]>();
        double[] At(int k) => cache.TryGetValue(k, out var r) ? r : cache[k] = rates(k);
        var (steps, found) = (new int?[checks], new double[checks]);
        for (var j = 0; j < checks; j++)
        {
            steps[j] = Smallest(k => At(k)[j] >= target, 0, LastStep);
            found[j] = At(steps[j] ?? LastStep)[j];
        }
        return (steps, found);
    }

    /// <summary>The smallest step in [lo, hi] where <paramref name="holds"/> (taken as monotone), by doubling then bisection; null if none.</summary>
    private static int? Smallest(Func<int, bool> holds, int lo, int hi)
    {
        var below = lo - 1;
        var k = lo;
        while (!holds(k))
        {
            if (k >= hi) return null;
            below = k;
            k = Math.Min(hi, k + StepsPerDoubling);
        }
        // holds(k), not holds(below): bisect between them.
        while (k - below > 1)
        {
            var mid = (k + below) / 2;
            if (holds(mid)) k = mid; else below = mid;
        }
        return k;
    }

    /// <summary>The smallest drift size (to ±3%) where <paramref name="holds"/>, searched from 10⁻⁴ up to <paramref name="largest"/>; null if none.</summary>
    private static double? SmallestDrift(Func<double, bool> holds, double largest)
    {
        var s = Math.Min(1e-4, largest);
        var below = 0.0;
        while (!holds(s))
        {
            if (s >= largest) return null;
            below = s;
            s = Math.Min(largest, s * 2);
        }
        if (below == 0) return s;
        // Geometric bisection: the sizes span decades.
        while (s / below > 1.03)
        {
            var mid = Math.Sqrt(s * below);
            if (holds(mid)) s = mid; else below = mid;
        }
        return s;
    }
}
