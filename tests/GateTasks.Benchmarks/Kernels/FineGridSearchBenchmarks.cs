using BenchmarkDotNet.Attributes;
using GateTasks.Benchmarks.Harness;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// The cell search alone of the fill that quantile and distance checks pay per value: one search over the union of a
/// feature's coarse 40-bin equal-probability edges and its fine grid's (4 096 cells and 4 dyadic tail levels, laid on
/// 200 000 reference events), on one 65 536-row slice of each of the benchmark's 20 float32 features, in blocks of
/// 512 values as the fill calls it; with the guide table in front of the three-level count, and the three levels
/// alone. Per value.
/// </summary>
public class FineGridSearchBenchmarks
{
    private const int Rows = 65_536;
    private const int Block = 512;
    private float[][] _values = [];
    private UnionEdgeSearch[] _searches = [];
    private readonly int[] _cells = new int[Block];

    /// <summary>Whether the guide table goes first.</summary>
    [Params(true, false)]
    public bool Guided { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var features = SyntheticFeatures.Count;
        _values = new float[features][];
        _searches = new UnionEdgeSearch[features];
        var reference = new float[200_000];
        for (var f = 0; f < features; f++)
        {
            SyntheticFeatures.Generate(f, 2, 0, reference);
            var grid = new QuantileGrid(reference.Min(), reference.Max());
            grid.Fine.Fill(reference);
            var fine = grid.FineEdges(ReferenceBuilder.FineGridBins, ReferenceBuilder.FineGridTailLevels);
            _searches[f] = new UnionEdgeSearch(grid.EqualProbabilityEdges(40), fine, Guided);
            _values[f] = new float[Rows];
            SyntheticFeatures.Generate(f, 1, 0, _values[f]);
        }
    }

    [Benchmark(OperationsPerInvoke = Rows * SyntheticFeatures.Count)]
    public int UnionCells()
    {
        var sum = 0;
        for (var f = 0; f < _values.Length; f++)
        {
            for (var start = 0; start < Rows; start += Block)
            {
                _searches[f].Cells(_values[f].AsSpan(start, Block), _cells);
                sum += _cells[Block - 1];
            }
        }
        return sum;
    }
}
