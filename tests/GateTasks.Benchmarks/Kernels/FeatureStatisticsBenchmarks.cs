using BenchmarkDotNet.Attributes;
using GateTasks.Engine.References;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// <c>FeatureStatistics.Add</c> (moments, power sums, extremes) over one batch of 65 536 normal values, the size a
/// Parquet row group is handed on in, unweighted and weighted. Reported per value.
/// </summary>
[MemoryDiagnoser]
public class FeatureStatisticsBenchmarks
{
    private const int Values = 1 << 16;
    private double[] _values = [];
    private double[] _weights = [];

    [Params(false, true)]
    public bool Weighted { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20_240_612);
        _values = new double[Values];
        _weights = new double[Values];
        for (var i = 0; i < Values; i++)
        {
            _values[i] = Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
            _weights[i] = 0.5 + random.NextDouble();
        }
    }

    [Benchmark(OperationsPerInvoke = Values)]
    public long Add()
    {
        var statistics = new FeatureStatistics();
        statistics.Add(_values, Weighted ? _weights : ReadOnlySpan<double>.Empty);
        return statistics.Count;
    }
}
