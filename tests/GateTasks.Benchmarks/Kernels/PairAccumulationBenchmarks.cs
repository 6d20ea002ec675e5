using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Samples;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// The declared pairs' batched fill, <c>PairAccumulation.Add</c> on one thread, in the benchmark contract's shape: every
/// pair of five features (ten pairs without a χ² test, so each fills the coarse map grid), three on 40-bin
/// equal-probability axes and two on 50-bin regular ones, over batches of 65 536 events. Reported per event: the
/// correlation kind's per-event cost beyond the plain checks, the reading of the sample aside.
/// </summary>
[MemoryDiagnoser]
public class PairAccumulationBenchmarks
{
    private const int Rows = 65_536;
    private const int Batches = 8;
    private const int Features = 5;
    private FeatureView _view = null!;
    private Histogram[] _references = null!;
    private CorrelationSpec[] _pairs = null!;

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20_261_204);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
        var features = new double[Features][];
        for (var f = 0; f < Features; f++) features[f] = new double[Rows];
        for (var i = 0; i < Rows; i++)
        {
            var u = Normal();
            features[0][i] = u;
            features[1][i] = 0.6 * u + 0.8 * Normal();
            features[2][i] = 75 + 15 * Normal();
            features[3][i] = Math.Exp(0.5 * Normal());
            features[4][i] = 0.3 * u + Normal();
        }
        // Values as a float32 column widens them, as the sample's are.
        foreach (var f in features)
            for (var i = 0; i < Rows; i++) f[i] = (float)f[i];
        _view = new FeatureView(features, [], false, new long[Rows]) { Rows = Rows };
        Axis Quantile(double[] v)
        {
            var sorted = v.Order().ToArray();
            var edges = Enumerable.Range(0, 41).Select(k => sorted[Math.Min(Rows - 1, k * Rows / 40)]).ToArray();
            edges[^1] = Math.BitIncrement(sorted[^1]);
            return new VariableAxis(edges);
        }
        Axis[] axes = [Quantile(features[0]), Quantile(features[1]), new RegularAxis(50, 25, 125), Quantile(features[3]), new RegularAxis(50, -2.5, 2.5)];
        _references = axes.Select((a, f) =>
        {
            var h = new Histogram(a);
            h.Fill(features[f], ReadOnlySpan<double>.Empty);
            return h;
        }).ToArray();
        var at = new SourceLocation("bench.yaml");
        _pairs = (from a in Enumerable.Range(0, Features) from b in Enumerable.Range(a + 1, Features - a - 1)
                  select new CorrelationSpec($"f{a}", $"f{b}", null, null, at)).ToArray();
    }

    [Benchmark(OperationsPerInvoke = Rows * Batches)]
    public double Add()
    {
        var index = Enumerable.Range(0, Features).ToDictionary(f => $"f{f}");
        var pairs = new PairAccumulation(_pairs, index, f => _references[f]);
        for (var b = 0; b < Batches; b++) pairs.Add(_view, 1);
        return pairs.Pairs[0].Pearson;
    }

    /// <summary>
    /// The same fill timed by the process's CPU time rather than the clock (for a machine shared with other work):
    /// <paramref name="repeat"/> times <see cref="Add"/>, and the CPU nanoseconds per event of the fastest.
    /// </summary>
    public static double CpuNanosecondsPerEvent(int repeat)
    {
        var bench = new PairAccumulationBenchmarks();
        bench.Setup();
        bench.Add();
        var best = double.PositiveInfinity;
        for (var k = 0; k < repeat; k++)
        {
            var before = System.Diagnostics.Process.GetCurrentProcess().TotalProcessorTime;
            bench.Add();
            var spent = System.Diagnostics.Process.GetCurrentProcess().TotalProcessorTime - before;
            best = Math.Min(best, spent.TotalNanoseconds / (Rows * Batches));
        }
        return best;
    }
}
