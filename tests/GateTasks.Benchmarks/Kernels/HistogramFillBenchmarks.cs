using BenchmarkDotNet.Attributes;
using GateTasks.Engine.Histograms;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// <c>Histogram.Fill(span, span)</c> over one batch of normal values, on an equal-width axis (index computed) and on
/// an equal-probability axis (index searched), unweighted and weighted. Reported per value.
/// </summary>
[MemoryDiagnoser]
public class HistogramFillBenchmarks
{
    private const int Values = 1_000_000;
    private double[] _values = [];
    private double[] _weights = [];
    private Axis _axis = null!;

    [Params("regular", "variable")]
    public string Axis { get; set; } = "regular";

    [Params(false, true)]
    public bool Weighted { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        var random = new Random(20_240_611);
        _values = new double[Values];
        _weights = new double[Values];
        for (var i = 0; i < Values; i++)
        {
            _values[i] = Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
            _weights[i] = 0.5 + random.NextDouble();
        }
        _axis = Axis == "regular" ? new RegularAxis(40, -4, 4) : EqualProbabilityAxis(_values, 40);
    }

    [Benchmark(OperationsPerInvoke = Values)]
    public double Fill()
    {
        var histogram = new Histogram(_axis);
        histogram.Fill(_values, Weighted ? _weights : ReadOnlySpan<double>.Empty);
        return histogram.SumW[1];
    }

    // Edges at the sample's own quantiles, as a reference's quantile binning lays them.
    private static VariableAxis EqualProbabilityAxis(double[] values, int bins)
    {
        var sorted = values.Order().ToArray();
        var edges = Enumerable.Range(0, bins + 1).Select(k => sorted[Math.Min(sorted.Length - 1, (long)k * sorted.Length / bins)]).ToArray();
        edges[^1] = Math.BitIncrement(sorted[^1]);
        return new VariableAxis(edges);
    }
}
