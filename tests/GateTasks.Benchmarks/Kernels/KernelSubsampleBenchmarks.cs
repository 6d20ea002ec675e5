using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Samples;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// <c>KernelSubsample</c>: the sample side of the joint block's kernel distance, 10⁶ weighted rows of d features in
/// batches of 65 536 hashed and compared with the bottom-K threshold (K = 50 000), reported per row; and the kept rows
/// put through the cubic kernel's feature map once at the end (<c>Sums</c>), reported per call; and the row hash
/// alone, the floor of the per-row cost; for d = 5 and d = 20. One core.
/// </summary>
[MemoryDiagnoser]
public class KernelSubsampleBenchmarks
{
    private const int Rows = 1_000_000, Batch = 65_536, Limit = 50_000;
    private FeatureView[] _batches = [];
    private int[] _features = [];
    private KernelSubsample _filled = null!;

    [Params(5, 20)]
    public int Width { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20_261_203);
        _features = Enumerable.Range(0, Width).ToArray();
        _batches = Enumerable.Range(0, (Rows + Batch - 1) / Batch).Select(b =>
        {
            var n = Math.Min(Batch, Rows - b * Batch);
            var columns = Enumerable.Range(0, Width).Select(_ => Enumerable.Range(0, n).Select(_ => 2 * random.NextDouble() - 1).ToArray()).ToArray();
            var weights = Enumerable.Range(0, n).Select(_ => random.NextDouble() < 0.05 ? -0.5 : 1).ToArray();
            return new FeatureView(columns, weights, weighted: true, Enumerable.Range(0, n).Select(i => (long)i).ToArray()) { Rows = n };
        }).ToArray();
        _filled = new KernelSubsample(Width, Limit);
        foreach (var view in _batches) _filled.Add(view, _features);
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public int AddPerRow()
    {
        var subsample = new KernelSubsample(Width, Limit);
        foreach (var view in _batches) subsample.Add(view, _features);
        return subsample.Entries;
    }

    [Benchmark(OperationsPerInvoke = Rows)]
    public ulong HashPerRow()
    {
        var hashes = new ulong[256];
        ulong least = ulong.MaxValue;
        foreach (var view in _batches)
            for (var start = 0; start < view.Rows; start += 256)
            {
                var h = hashes.AsSpan(0, Math.Min(256, view.Rows - start));
                JointRowHash.Begin(h);
                foreach (var f in _features) JointRowHash.Mix(view.Feature(f).Slice(start, h.Length), h);
                JointRowHash.End(h);
                foreach (var x in h) least = Math.Min(least, x);
            }
        return least;
    }

    [Benchmark]
    public long SumsOfTheKeptRows() => _filled.Sums(new double[Width], Enumerable.Repeat(1.0, Width).ToArray(), JointMoments.Blocks).Rows;
}
