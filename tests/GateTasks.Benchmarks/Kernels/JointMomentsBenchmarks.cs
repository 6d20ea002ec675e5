using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Samples;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// <c>JointMoments.Add</c> with covariance moments only (what every joint block gathers for the Fréchet distance and the
/// global score): 10⁶ rows × d features in batches of 65 536, standardised, interleaved by block and summed; unweighted,
/// and weighted with a tenth of the weights negative. Reported per row.
/// </summary>
[MemoryDiagnoser]
public class JointMomentsBenchmarks
{
    private const int Rows = 1_000_000, Batch = 1 << 16;
    private double[][] _columns = [];
    private double[] _weights = [];

    [Params(5, 20)]
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
            for (var i = 0; i < Rows; i++) _columns[k][i] = 3 + Normal() + (k > 0 ? 0.5 * _columns[k - 1][i] : 0);
        }
        _weights = new double[Rows];
        for (var i = 0; i < Rows; i++) _weights[i] = random.NextDouble() < 0.1 ? -0.5 : 0.5 + random.NextDouble();
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public long AddPerRow()
    {
        var features = Enumerable.Range(0, Features).ToArray();
        var standardisation = new JointStandardisation(Enumerable.Repeat(3.0, Features).ToArray(), Enumerable.Repeat(1.5, Features).ToArray());
        var moments = new JointMoments(features, standardisation, moments: true, kernel: false);
        var batch = new double[Features][];
        for (var k = 0; k < Features; k++) batch[k] = new double[Batch];
        var weights = new double[Batch];
        var fileRows = new long[Batch];
        var view = new FeatureView(batch, weights, Weighted, fileRows);
        for (var start = 0; start < Rows; start += Batch)
        {
            var n = Math.Min(Batch, Rows - start);
            for (var k = 0; k < Features; k++) _columns[k].AsSpan(start, n).CopyTo(batch[k]);
            _weights.AsSpan(start, n).CopyTo(weights);
            for (var i = 0; i < n; i++) fileRows[i] = start + i;
            view.Rows = n;
            moments.Add(view);
        }
        return moments.Rows;
    }
}
