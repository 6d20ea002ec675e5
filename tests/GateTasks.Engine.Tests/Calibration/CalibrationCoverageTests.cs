using System.Globalization;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Statistics;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Calibration;

/// <summary>
/// The calibration study covers pair correlation checks, the pair 2-D χ² test and surrogates with negative weights,
/// each check with its own rates; the joint block's checks are left out (docs/contract.md: not calibrated).
/// </summary>
public sealed class CalibrationCoverageTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-calib-cover-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    /// <summary>A heavy-tailed correlated pair (energy-like e, response-like r = e (1 + 0.9 t₅)) and a normal x, with pair and joint checks.</summary>
    private (PrecisionContract, ReferenceHistograms) Setup(string pairChecks, bool joint)
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, $"""
            contract-version: 1
            sample: s.csv
            reference: ref.parquet
            decision: {"{"} false-alarm: 0.10, confidence: 0.95 {"}"}
            defaults:
              binning: {"{"} bins: 12, spacing: quantile {"}"}
              checks:
                ks-max: 0.05
                mean-shift-max: 0.1
            features:
              - name: e
              - name: r
              - name: x
            correlations:
              - features: [e, r]
            {pairChecks}
            {(joint ? "joint: { features: [e, r, x], frechet-max: 0.05 }" : "")}
            """);
        var contract = ContractLoader.Load(contractPath);
        var rng = new Xoshiro256StarStar(17, threadSafe: false);
        var csv = Path.Combine(_dir, "fullsim.csv");
        using (var w = new StreamWriter(csv))
        {
            w.WriteLine("e,r,x");
            for (var i = 0; i < 30_000; i++)
            {
                var e = LogNormal.Sample(rng, 3, 0.8);
                var r = e * (1 + 0.9 * StudentT.Sample(rng, 0, 1, 5));
                w.WriteLine(string.Join(",", new[] { e, r, Normal.Sample(rng, 0, 1) }.Select(v => v.ToString("R", CultureInfo.InvariantCulture))));
            }
        }
        return (contract, ReferenceBuilder.Build(contract, [csv], null, "test"));
    }

    [Fact]
    public void Pair_and_2d_checks_are_in_every_replica_the_joint_block_is_left_out_and_the_level_is_kept()
    {
        var (contract, reference) = Setup("    pearson-max: 0.01\n    spearman-max: 0.01\n    chi2-2d-test: on", joint: true);
        var result = CalibrationStudy.Run(contract, reference, Drift.Null, null, 20_000, 120, seed: 2);
        var subjects = result.Checks.Select(c => $"{c.Subject}/{c.Check}").ToList();
        Assert.Contains("e~r/pearson-max", subjects);
        Assert.Contains("e~r/spearman-max", subjects);
        Assert.Contains("e~r/chi2-2d-test", subjects);
        Assert.DoesNotContain(subjects, s => s.StartsWith("joint(", StringComparison.Ordinal));
        Assert.Equal(contract.Features.Sum(f => f.Checks.Count) + 3, result.Checks.Count);
        // A tolerance of 0.01 is far below the pair's noise at these sizes, so a real measurement leaves the
        // correlation checks undecided in most replicas (compares the program with itself: the study's own rates).
        Assert.True(result.Checks.Single(c => c.Check == "pearson-max").Inconclusive > 60);
        // Clopper–Pearson (1934) 95% interval of the contract's false-alarm rate reaches down to the level (10%).
        Assert.True(result.FailRateInterval.Lower <= 0.10, $"false-alarm rate {result.FailRate}");
        // The tests are significant on their own at about the level's rate, not never and not always.
        foreach (var test in result.Checks.Where(c => c.IsTest))
            Assert.True(test.SignificantRateInterval.Lower <= 0.10 && test.Significant < 60, $"{test.Subject}/{test.Check}: {test.Significant} of {test.Replicas}");
    }

    [Fact]
    public void Negative_weights_are_drawn_with_the_stated_fraction_and_keep_the_level()
    {
        var (contract, reference) = Setup("    pearson-max: 0.05\n    spearman-max: 0.05", joint: false);
        var law = new WeightLaw(0.1);
        var result = CalibrationStudy.Run(contract, reference, Drift.Null, null, 20_000, 120, seed: 3, law);
        Assert.Same(law, result.Weights);
        Assert.True(result.FailRateInterval.Lower <= 0.10, $"false-alarm rate {result.FailRate}");

        // A replica's histogram of n events: Σw² = n and Σw = n (1 − 2f) on average, so the Kish (1965) effective
        // count (Σw)²/Σw² is n (1 − 2f)² = 0.64 n for f = 0.1.
        var rng = new Xoshiro256StarStar(5, threadSafe: false);
        var axis = reference.Find("x")!.Histogram.Axis;
        var counts = ReplicaSampler.Draw(axis, Enumerable.Repeat(1.0 / (axis.Count + 2), axis.Count + 2).ToArray(), 200_000, rng);
        var signed = law.Apply(counts, rng);
        double sumW = 0, sumW2 = 0;
        for (var c = 0; c < signed.SumW.Length; c++) (sumW, sumW2) = (sumW + signed.SumW[c], sumW2 + signed.SumW2[c]);
        Assert.Equal(200_000, sumW2);
        Assert.InRange(KishCount.Of(sumW, sumW2) / 200_000, 0.64 - 0.01, 0.64 + 0.01);
        Assert.Equal(0.64, law.EffectiveShare, 12);
    }

    [Fact]
    public void Events_on_points_accumulate_as_the_events_one_by_one()
    {
        // Compares the program with itself: the replicas' shortcut (each point once with its events' summed weight,
        // Σw² and the count set to the events') against adding every ±1 event to the same accumulator.
        double[] x = [1.0, 2.5, -0.3, 4.0], y = [0.2, 1.9, -1.0, 7.5];
        long[] positive = [3, 0, 5, 2], negative = [1, 2, 0, 1];
        var oneByOne = new WeightedCorrelation();
        // Positive events first, so the running Σw never passes through zero on the way (the one-by-one update
        // cannot divide by a zero Σw).
        for (var i = 0; i < x.Length; i++)
            for (var k = 0; k < positive[i]; k++) oneByOne.Add(x[i], y[i], 1);
        for (var i = 0; i < x.Length; i++)
            for (var k = 0; k < negative[i]; k++) oneByOne.Add(x[i], y[i], -1);
        var w = positive.Zip(negative, (p, n) => (double)(p - n)).ToArray();
        var points = PairReplica.Events(x, y, w, positive.Sum() + negative.Sum());
        Assert.Equal(oneByOne.Pearson, points.Pearson, 12);
        Assert.Equal(oneByOne.AsymptoticVariance, points.AsymptoticVariance, 10);
        Assert.Equal(oneByOne.EffectiveCount, points.EffectiveCount, 12);
        Assert.Equal(oneByOne.SumOfWeights, points.SumOfWeights, 12);
    }

    [Fact]
    public void The_copula_reproduces_the_stored_rank_correlation()
    {
        // Spearman's ρ of a Gaussian copula with normal-score correlation r is (6/π) asin(r/2) (Pearson 1907), so
        // the fitted r = 2 sin(π ρ/6) gives back ρ; measured with MathNet.Numerics 5 Correlation.Spearman on the points.
        var axis = new RegularAxis(10, 0, 1);
        var flat = Enumerable.Repeat(1.0, 12).ToArray();
        flat[0] = flat[^1] = 0;
        var h = Histogram.FromCells(axis, flat, flat, 10, 0, 0, 0);
        foreach (var rho in new[] { -0.4, 0.3, 0.8 })
        {
            var (a, b) = GaussianCopula.Draw(h, h, rho, 40_000, new Xoshiro256StarStar(9, threadSafe: false));
            Assert.InRange(MathNet.Numerics.Statistics.Correlation.Spearman(a, b), rho - 0.015, rho + 0.015);
        }
    }
}
