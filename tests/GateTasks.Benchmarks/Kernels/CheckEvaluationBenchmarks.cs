using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// Evaluation of binned checks on one feature once its histograms are filled: the KS distance with its band, the
/// KS test, the χ² homogeneity test (with sparse-cell merging) and the core bin ratios, on 40 equal-probability bins.
/// </summary>
[MemoryDiagnoser]
public class CheckEvaluationBenchmarks
{
    private static readonly SourceLocation At = new("benchmark.yaml", 1, 1);
    private FeatureComparison _comparison = null!;
    private CheckSpec _spec = null!;

    [Params("ks-max", "ks-test", "chi2-test", "ratio-max-core")]
    public string Check { get; set; } = "ks-max";

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(7);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
        var referenceValues = Enumerable.Range(0, 200_000).Select(_ => Normal()).ToArray();
        var sorted = referenceValues.Order().ToArray();
        var edges = Enumerable.Range(0, 41).Select(k => sorted[Math.Min(sorted.Length - 1, k * sorted.Length / 40)]).ToArray();
        edges[^1] = Math.BitIncrement(sorted[^1]);
        var axis = new VariableAxis(edges);
        var reference = new Histogram(axis);
        reference.Fill(referenceValues, ReadOnlySpan<double>.Empty);
        var surrogate = new Histogram(axis);
        surrogate.Fill(Enumerable.Range(0, 100_000).Select(_ => Normal()).ToArray(), ReadOnlySpan<double>.Empty);

        var spec = new FeatureSpec("x", "x", FeatureKind.Continuous, new QuantileBinning(40, At),
            new CoreSpec(0.05, 0.95, At), [], At, At);
        var summary = new FeatureSummary(200_000, 200_000, 200_000, 0, 1, sorted[0], sorted[^1], 0);
        var referenceFeature = new ReferenceFeature("x", "x", FeatureKind.Continuous, "quantile:40", reference, summary,
            [new QuantilePoint(0.05, sorted[10_000]), new QuantilePoint(0.95, sorted[190_000])]);
        var core = Enumerable.Range(0, 40).Select(b => b is >= 2 and < 38).ToList();
        _comparison = new FeatureComparison(spec, referenceFeature, surrogate, summary, core);
        _spec = Check switch
        {
            "ks-max" => new ToleranceCheck(CheckKind.KolmogorovSmirnov, 0.01, At),
            "ks-test" => new GoodnessOfFitTest(CheckKind.KolmogorovSmirnovTest, At),
            "chi2-test" => new GoodnessOfFitTest(CheckKind.ChiSquareTest, At),
            _ => new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Core, 0.03, At),
        };
    }

    [Benchmark]
    public double Evaluate() => CheckEvaluator.Measure(_comparison, _spec, DecisionSettings.Default).Estimate;
}
