using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Samples;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// A declared pair's streamed fill, <c>PairCorrelation.Add</c>, over batches of 65 536 correlated normal pairs on
/// 40-bin equal-probability axes: Pearson's and Spearman's sums alone (no 2-D cells), with the map grid's cells (a
/// pair without a χ² test, 12 × 12 and the flows), and with the features' own axes' cells (a pair with a χ² test).
/// Reported per event.
/// </summary>
[MemoryDiagnoser]
public class PairCorrelationBenchmarks
{
    private const int Rows = 65_536;
    private const int Batches = 8;
    private FeatureView _view = null!;
    private Axis _axis = null!;
    private MarginalCdf _cdf = null!;
    private static readonly CorrelationSpec Spec = new("a", "b", null, null, new SourceLocation("bench.yaml"));

    [Params("none", "map", "features")]
    public string Cells { get; set; } = "none";

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20_261_203);
        var x = new double[Rows];
        var y = new double[Rows];
        for (var i = 0; i < Rows; i++)
        {
            var u = Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
            var v = Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
            (x[i], y[i]) = (u, 0.6 * u + 0.8 * v);
        }
        _view = new FeatureView([x, y], [], false, new long[Rows]) { Rows = Rows };
        var sorted = x.Order().ToArray();
        var edges = Enumerable.Range(0, 41).Select(k => sorted[Math.Min(Rows - 1, k * Rows / 40)]).ToArray();
        edges[^1] = Math.BitIncrement(sorted[^1]);
        _axis = new VariableAxis(edges);
        var h = new Histogram(_axis);
        h.Fill(x, ReadOnlySpan<double>.Empty);
        _cdf = new MarginalCdf(h);
    }

    [Benchmark(OperationsPerInvoke = Rows * Batches)]
    public double Add()
    {
        var joint = Cells switch
        {
            "map" => PairGrid.For(Spec, _axis, _axis),
            "features" => new Histogram2D(_axis, _axis),
            _ => null,
        };
        var pair = new PairCorrelation(Spec, 0, 1, _cdf, _cdf, joint);
        for (var b = 0; b < Batches; b++) pair.Add(_view);
        return pair.Pearson;
    }
}
