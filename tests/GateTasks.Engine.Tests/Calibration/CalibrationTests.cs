using System.Globalization;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Tests.Calibration;

/// <summary>
/// Small fixed-seed versions of the calibration study, so a regression in the decision machinery fails the build:
/// a false-alarm bound on null replicas and a minimum detection rate on an injected drift.
/// </summary>
public sealed class CalibrationTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-calib-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    /// <summary>A contract of <paramref name="continuous"/> Gaussian features (4 effect checks each) plus one discrete one, and its reference.</summary>
    private (PrecisionContract, ReferenceHistograms) Setup(int continuous, string decision, int referenceEvents = 50_000)
    {
        var names = Enumerable.Range(0, continuous).Select(i => $"x{i}").ToList();
        var features = string.Join("\n", names.Select(n => $"  - name: {n}")) + "\n  - name: k\n    kind: discrete\n    checks: { ratio-max: 0.1 }";
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, $"""
            contract-version: 1
            sample: s.csv
            reference: ref.parquet
            decision: {decision}
            defaults:
              binning: {"{"} bins: 10 {"}"}
              checks:
                ks-max: 0.05
                wasserstein-max: 0.1
                ratio-max: {"{"} core: 0.1, tails: 0.3 {"}"}
                quantile-shift-max: 0.1
                mean-shift-max: 0.1
                width-ratio-max: 0.1
                chi2-test: on
                ad-test: on
                cvm-test: on
                ks-test: on
            features:
            {features}
            """);
        var contract = ContractLoader.Load(contractPath);
        var rng = new Xoshiro256StarStar(7, threadSafe: false);
        var csv = Path.Combine(_dir, "fullsim.csv");
        using (var w = new StreamWriter(csv))
        {
            w.WriteLine(string.Join(",", names.Append("k")));
            for (var r = 0; r < referenceEvents; r++)
                w.WriteLine(string.Join(",", names.Select(_ => Normal.Sample(rng, 0, 1).ToString("R", CultureInfo.InvariantCulture))
                    .Append(Poisson.Sample(rng, 1.5).ToString(CultureInfo.InvariantCulture))));
        }
        var reference = ReferenceBuilder.Build(contract, [csv], null, "test");
        return (contract, reference);
    }

    [Fact]
    public void Null_replicas_fail_no_more_often_than_the_stated_level()
    {
        // A loose level (10%) so that a miscalibration would show within 300 replicas.
        var (contract, reference) = Setup(3, "{ false-alarm: 0.10, confidence: 0.95 }");
        var result = CalibrationStudy.Run(contract, reference, Drift.Null, null, 20_000, 300, seed: 11);
        // Clopper–Pearson (1934) 95% interval of the observed rate must reach down to the level.
        Assert.True(result.FailRateInterval.Lower <= 0.10, $"false-alarm rate {result.FailRate} over {result.Replicas} replicas");
        Assert.True(result.FailRate <= 0.10 + 3 * Math.Sqrt(0.1 * 0.9 / 300));
    }

    [Fact]
    public void A_contract_of_200_checks_keeps_its_family_wise_level()
    {
        // 49 continuous features × 4 checks + 1 discrete check + … = at least 200 checks, level 5%.
        var (contract, reference) = Setup(50, "{ false-alarm: 0.05 }", referenceEvents: 20_000);
        Assert.True(contract.Features.Sum(f => f.Checks.Count) >= 200);
        var result = CalibrationStudy.Run(contract, reference, Drift.Null, null, 20_000, 100, seed: 5);
        Assert.True(result.FailRateInterval.Lower <= 0.05, $"false-alarm rate {result.FailRate}");
        // Without a correction, 200 checks at 5% would fail almost every replica; with Holm, few if any.
        Assert.True(result.Failed <= 10, $"{result.Failed} of 100 null replicas failed");
    }

    [Fact]
    public void Injected_drifts_are_caught_at_a_minimum_rate()
    {
        var (contract, reference) = Setup(2, "{ false-alarm: 0.01 }");
        // Twice the tails' ratio tolerance of 0.3: outside a stated tolerance, so a tolerance check must fail it (the
        // goodness-of-fit tests, which once caught a 30% deficit at the tolerance itself, are diagnostics now).
        var tail = CalibrationStudy.Run(contract, reference, new Drift(DriftKind.TailDeficit, 0.6, "60% tail deficit"), "x0", 50_000, 60, seed: 3);
        Assert.True(tail.FailRate >= 0.9, $"60% tail deficit caught in {tail.FailRate:P0}");
        var scale = CalibrationStudy.Run(contract, reference, new Drift(DriftKind.Width, 0.2, "20% width"), "x1", 50_000, 60, seed: 4);
        Assert.True(scale.FailRate >= 0.9, $"20% width increase caught in {scale.FailRate:P0}");
    }

    [Fact]
    public void Binomial_draws_have_the_binomial_mean_and_variance()
    {
        // Mean np and variance np(1−p) of the binomial distribution (textbook formulas), in both regimes of the sampler.
        var rng = new Xoshiro256StarStar(99, threadSafe: false);
        foreach (var (p, n) in new[] { (0.001, 5000L), (0.3, 1_000_000L), (0.97, 400L) })
        {
            var draws = Enumerable.Range(0, 20_000).Select(_ => (double)ReplicaSampler.Binomial(rng, p, n)).ToArray();
            var mean = draws.Average();
            var variance = draws.Select(x => (x - mean) * (x - mean)).Sum() / (draws.Length - 1);
            var sd = Math.Sqrt(n * p * (1 - p));
            Assert.InRange(mean, n * p - 5 * sd / Math.Sqrt(draws.Length), n * p + 5 * sd / Math.Sqrt(draws.Length));
            Assert.InRange(variance / (n * p * (1 - p)), 0.95, 1.05);
        }
    }

    [Fact]
    public void A_scale_shift_moves_probability_as_the_mapped_CDF_says()
    {
        // Uniform reference on [0, 10) in 10 bins; scaling by 1.25 maps it onto [0, 12.5): by hand, each of the first
        // 10 bins then holds 1/12.5 = 0.08 and the overflow 2.5/12.5 = 0.2.
        var axis = new RegularAxis(10, 0, 10);
        var cells = new double[12];
        for (var i = 1; i <= 10; i++) cells[i] = 100;
        var h = Histogram.FromCells(axis, cells, cells, 1000, 0, 0, 0);
        var f = new ReferenceFeature("u", "u", FeatureKind.Continuous, "uniform:10:0:10", h, new FeatureSummary(1000, 1000, 1000, 5, 2.9, 0, 10, 0), []);
        var p = DriftedDistribution.CellProbabilities(f, Enumerable.Repeat(true, 10).ToArray(), new Drift(DriftKind.Scale, 0.25, "x"));
        Assert.Equal(0, p[0], 12);
        for (var i = 1; i <= 10; i++) Assert.Equal(0.08, p[i], 12);
        Assert.Equal(0.2, p[11], 12);
    }
}
