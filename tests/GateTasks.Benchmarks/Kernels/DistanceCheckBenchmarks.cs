using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// One feature's distance checks once its cells are gathered: wasserstein-max on the reference's fine grid (4 096
/// equal-probability cells) and jsd-max on 40 coarse bins, each with its bootstraps (200 replicas for the standard
/// errors and the bias, 200 at the tolerance when the estimate exceeds it). A reference of 200 000 normal events
/// against a surrogate of 1 000 (the estimate above the tolerance: both bootstraps run) or 1 000 000 (below it).
/// </summary>
[MemoryDiagnoser]
public class DistanceCheckBenchmarks
{
    private static readonly SourceLocation At = new("benchmark.yaml", 1, 1);
    private FeatureComparison _comparison = null!;
    private CheckSpec _spec = null!;

    [Params("wasserstein-max", "jsd-max")]
    public string Check { get; set; } = "wasserstein-max";

    [Params(1_000, 1_000_000)]
    public int Events { get; set; } = 1_000;

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(7);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
        var referenceValues = Enumerable.Range(0, 200_000).Select(_ => Normal()).ToArray();
        var sorted = referenceValues.Order().ToArray();
        double[] Edges(int bins) =>
            Enumerable.Range(0, bins + 1).Select(k => sorted[Math.Min(sorted.Length - 1, (long)k * sorted.Length / bins)]).Distinct().ToArray();
        var axis = new VariableAxis(Edges(40));
        var reference = new Histogram(axis);
        reference.Fill(referenceValues, ReadOnlySpan<double>.Empty);
        var sampleValues = Enumerable.Range(0, Events).Select(_ => Normal()).ToArray();
        var surrogate = new Histogram(axis);
        surrogate.Fill(sampleValues, ReadOnlySpan<double>.Empty);
        var fineEdges = Edges(4096);
        var referenceGrid = new FineGridCounter(fineEdges);
        referenceGrid.Add(referenceValues, ReadOnlySpan<double>.Empty);
        var sampleGrid = new FineGridCounter(fineEdges);
        sampleGrid.Add(sampleValues, ReadOnlySpan<double>.Empty);

        var kind = Check == "jsd-max" ? CheckKind.JensenShannon : CheckKind.Wasserstein;
        _spec = new ToleranceCheck(kind, Check == "jsd-max" ? 0.001 : 0.01, At);
        var spec = new FeatureSpec("x", "x", FeatureKind.Continuous, new QuantileBinning(40, At), new CoreSpec(0.05, 0.95, At), [_spec], At, At);
        var summary = new FeatureSummary(200_000, 200_000, 200_000, 0, 1, sorted[0], sorted[^1], 0);
        var referenceFeature = new ReferenceFeature("x", "x", FeatureKind.Continuous, "quantile:40", reference, summary,
            [new QuantilePoint(0.05, sorted[10_000]), new QuantilePoint(0.95, sorted[190_000])], FineGrid: referenceGrid.Finish());
        var core = Enumerable.Range(0, 40).Select(b => b is >= 2 and < 38).ToList();
        _comparison = new FeatureComparison(spec, referenceFeature, surrogate, summary, core, SampleFineGrid: sampleGrid.Finish());
    }

    [Benchmark]
    public double Evaluate() => CheckEvaluator.Measure(_comparison, _spec, DecisionSettings.Default).Estimate;
}
