using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Statistics;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// <c>BlockedCovariance.AddBatch</c>: 10⁶ rows × d features (16 blocks) streamed in batches of 65 536 rows, unweighted
/// and weighted with a tenth of the weights negative; reported per value (row × feature). And the Fréchet estimate
/// (<c>FrechetExtrapolation.Of</c>: cyclic-window extrapolation and its block jackknife) from two such accumulations.
/// </summary>
[MemoryDiagnoser]
public class FrechetBenchmarks
{
    private const int Rows = 1_000_000, Batch = 1 << 16, Blocks = 16;
    private double[][] _columns = [];
    private double[] _weights = [];
    private BlockedCovariance _reference = null!, _sample = null!;

    [Params(20, 50)]
    public int Features { get; set; }

    [Params(false, true)]
    public bool Weighted { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20_261_203);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
        _columns = new double[Features][];
        for (var k = 0; k < Features; k++)
        {
            _columns[k] = new double[Rows];
            for (var i = 0; i < Rows; i++) _columns[k][i] = Normal() + (k > 0 ? 0.5 * _columns[k - 1][i] : 0);
        }
        _weights = new double[Rows];
        for (var i = 0; i < Rows; i++) _weights[i] = random.NextDouble() < 0.1 ? -0.5 : 0.5 + random.NextDouble();
        _reference = Stream();
        _sample = Stream();
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public long AddBatchPerRow() => Stream().Count;

    [Benchmark]
    public double Estimate() => FrechetExtrapolation.Of(_reference, _sample).Extrapolated;

    private BlockedCovariance Stream()
    {
        var acc = new BlockedCovariance(Features, Blocks);
        for (var start = 0; start < Rows; start += Batch)
        {
            var len = Math.Min(Batch, Rows - start);
            var columns = _columns.Select(c => new ReadOnlyMemory<double>(c, start, len)).ToArray();
            acc.AddBatch(columns, Weighted ? _weights.AsSpan(start, len) : ReadOnlySpan<double>.Empty, start);
        }
        return acc;
    }
}
