using BenchmarkDotNet.Attributes;
using GateTasks.Benchmarks.Harness;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// Filling the fine equal-probability grid that quantile and distance checks keep (4 096 cells and 4 dyadic tail
/// levels, laid on 200 000 reference events as a reference build lays it) with one 65 536-row slice of each of the
/// benchmark's 20 float32 features: widened to doubles (the path taken before float32 slices reached the grid), as
/// float32 values, both grids at once through one search over the union of their edges (the path a check of float32
/// features with unit weights takes), and, for scale, the coarse 40-bin equal-probability fill every feature pays
/// anyway. Per value.
/// </summary>
public class FineGridFillBenchmarks
{
    private const int Rows = 65_536;
    private float[][] _values = [];
    private double[] _widened = [];
    private FineGridCounter[] _counters = [];
    private Histogram[] _coarse = [];

    [GlobalSetup]
    public void Setup()
    {
        var features = SyntheticFeatures.Count;
        _values = new float[features][];
        _counters = new FineGridCounter[features];
        _coarse = new Histogram[features];
        _widened = new double[Rows];
        var reference = new float[200_000];
        for (var f = 0; f < features; f++)
        {
            SyntheticFeatures.Generate(f, 2, 0, reference);
            var grid = new QuantileGrid(reference.Min(), reference.Max());
            grid.Fine.Fill(reference);
            _counters[f] = new FineGridCounter(grid.FineEdges(ReferenceBuilder.FineGridBins, ReferenceBuilder.FineGridTailLevels));
            _coarse[f] = new Histogram(new VariableAxis(grid.EqualProbabilityEdges(40)));
            _values[f] = new float[Rows];
            SyntheticFeatures.Generate(f, 1, 0, _values[f]);
        }
    }

    [Benchmark(OperationsPerInvoke = Rows * SyntheticFeatures.Count)]
    public void FineWidened()
    {
        for (var f = 0; f < _values.Length; f++)
        {
            for (var i = 0; i < Rows; i++) _widened[i] = _values[f][i];
            _counters[f].Add(_widened, ReadOnlySpan<double>.Empty);
        }
    }

    [Benchmark(OperationsPerInvoke = Rows * SyntheticFeatures.Count)]
    public void FineFloat32()
    {
        for (var f = 0; f < _values.Length; f++) _counters[f].Add(_values[f]);
    }

    [Benchmark(OperationsPerInvoke = Rows * SyntheticFeatures.Count)]
    public void FineAndCoarseFloat32()
    {
        for (var f = 0; f < _values.Length; f++)
            if (!_counters[f].Add(_values[f], _coarse[f])) throw new InvalidOperationException("The union search is not supported here.");
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Rows * SyntheticFeatures.Count)]
    public void Coarse40Float32()
    {
        for (var f = 0; f < _values.Length; f++) _coarse[f].Fill(_values[f]);
    }
}
