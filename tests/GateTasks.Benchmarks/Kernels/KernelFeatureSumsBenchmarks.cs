using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Statistics;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// <c>CubicKernelFeatureSums.Add</c>: the streamed part of the joint block's kernel distance, 2·10⁵ weighted rows of d
/// features folded into the C(d+3, 3) monomial sums of the cubic kernel; reported per row (event), for d = 5 (56
/// monomials) and d = 20 (1 771), the two joint blocks the end-to-end benchmark times. One core.
/// </summary>
[MemoryDiagnoser]
public class KernelFeatureSumsBenchmarks
{
    private const int Rows = 200_000;
    private double[] _rows = [];
    private double[] _weights = [];

    [Params(5, 20)]
    public int Width { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20_261_203);
        _rows = new double[Rows * Width];
        for (var i = 0; i < _rows.Length; i++) _rows[i] = 2 * random.NextDouble() - 1;
        _weights = new double[Rows];
        for (var i = 0; i < Rows; i++) _weights[i] = random.NextDouble() < 0.05 ? -0.5 : 1;
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public double AddPerRow()
    {
        var sums = new CubicKernelFeatureSums(Width);
        for (var i = 0; i < Rows; i++) sums.Add(_rows.AsSpan(i * Width, Width), _weights[i]);
        return sums.State()[^1];
    }
}
