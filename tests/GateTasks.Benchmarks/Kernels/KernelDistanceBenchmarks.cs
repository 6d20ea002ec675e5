using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Statistics;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// <c>UnbiasedKernelDistance.Estimate</c> (unbiased MMD² with the cubic polynomial kernel, full sample and 10 seeded
/// blocks) on 50 000 weighted rows a side of d standard-normal features: d = 10 and 20 through the feature map,
/// d = 40 through the sub-block fallback. One call per operation, one core.
/// </summary>
[MemoryDiagnoser]
public class KernelDistanceBenchmarks
{
    private const int Rows = 50_000;
    private double[][] _x = [];
    private double[][] _y = [];
    private double[] _wx = [];
    private double[] _wy = [];

    [Params(10, 20, 40)]
    public int Width { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20_261_218);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
        double[][] Sample() => Enumerable.Range(0, Rows).Select(_ => Enumerable.Range(0, Width).Select(_ => Normal()).ToArray()).ToArray();
        _x = Sample();
        _y = Sample();
        _wx = Enumerable.Range(0, Rows).Select(_ => 0.5 + random.NextDouble()).ToArray();
        _wy = Enumerable.Range(0, Rows).Select(_ => 0.5 + random.NextDouble()).ToArray();
    }

    [Benchmark]
    public double Estimate() => UnbiasedKernelDistance.Estimate(_x, _wx, _y, _wy, UnbiasedKernelDistance.DefaultBlocks, 1).FullSample;
}
