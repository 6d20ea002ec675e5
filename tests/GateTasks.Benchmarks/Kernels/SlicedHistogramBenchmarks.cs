using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.References;
using GateTasks.Engine.Statistics;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// <c>SlicedHistogramCounter.Add</c>: one batch of 65 536 rows of 20 features (normal, a Pearson-0.5 pair, one
/// log-normal) projected on K directions and filled into K fine grids of 512 equal-probability cells, with the
/// hash groups and exact addition at the end of the batch. Reported per row (event): the mean is ns per row
/// (OperationsPerInvoke = rows). <see cref="LongTails"/> adds a Cauchy feature and a log-normal of σ = 2, so the
/// reference's outermost edges lie hundreds of standard deviations out, as on real samples with rare extreme events.
/// </summary>
[MemoryDiagnoser]
public class SlicedHistogramBenchmarks
{
    private const int Rows = 1 << 16;
    private const int Features = 20;
    private double[][] _columns = [];
    private double[] _weights = [];
    private SlicedHistogramCounter _counter = null!;
    private GateTasks.Engine.Samples.FeatureView _view = null!;
    private int[] _features = [];

    [Params(64)]
    public int Projections { get; set; }

    [Params(false, true)]
    public bool Weighted { get; set; }

    [Params(false, true)]
    public bool LongTails { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20_261_203);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
        _columns = Enumerable.Range(0, Features).Select(_ => new double[Rows]).ToArray();
        for (var i = 0; i < Rows; i++)
        {
            for (var j = 0; j < Features; j++) _columns[j][i] = Normal();
            _columns[1][i] = 0.5 * _columns[0][i] + Math.Sqrt(0.75) * _columns[1][i];
            _columns[2][i] = Math.Exp(0.5 * _columns[2][i]);
            if (LongTails)
            {
                _columns[3][i] = Math.Tan(Math.PI * (random.NextDouble() - 0.5));
                _columns[4][i] = Math.Exp(2 * _columns[4][i]);
            }
        }
        _weights = Enumerable.Range(0, Rows).Select(_ => 0.5 + random.NextDouble()).ToArray();
        var names = Enumerable.Range(0, Features).Select(j => $"f{j}").ToArray();
        var means = _columns.Select(c => c.Average()).ToArray();
        var sds = _columns.Select((c, j) => Math.Sqrt(c.Sum(v => (v - means[j]) * (v - means[j])) / Rows)).ToArray();
        var projection = new SlicedProjection(SlicedDirections.Draw(names, Projections), means, sds);
        var builder = new SlicedGridBuilder(projection, _columns.Select(c => c.Min()).ToArray(), _columns.Select(c => c.Max()).ToArray());
        _features = Enumerable.Range(0, Features).ToArray();
        _view = new GateTasks.Engine.Samples.FeatureView(_columns, _weights, Weighted, new long[Rows]) { Rows = Rows };
        builder.Add(new GateTasks.Engine.Samples.FeatureView(_columns, _weights, weighted: false, new long[Rows]) { Rows = Rows }, _features);
        _counter = new SlicedHistogramCounter(projection, builder.Edges());
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public void Add() => _counter.Add(_view, _features);
}
