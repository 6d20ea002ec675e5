using BenchmarkDotNet.Attributes;
using GateTasks.Benchmarks.Harness;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Samples.Parquet;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// Where a check's streaming time goes, per value on one core: the benchmark sample's 20 float32 columns (Snappy,
/// 500 000-row row groups, 10^6 events) on the benchmark contract's axes (equal-probability edges of 40 bins at the
/// sample's own quantiles for 15 features, the five equal-width axes of <see cref="SyntheticFeatures.RegularAxes"/>).
/// <see cref="Decode"/> reads the file (positional reads, Snappy, PLAIN) into the stored floats the fill reads and
/// <see cref="Convert"/> also converts every column to doubles (what every column cost before float32 columns were
/// filled as floats); <see cref="Bin"/> finds the cells only, <see cref="Fill"/> also counts them,
/// <see cref="Moments"/> is the feature statistics, <see cref="Accumulate"/> all a feature's accumulation does per
/// batch for this contract (fill, exact absorption, moments) and <see cref="Stream"/> decoding and accumulating
/// together, as a check does. <see cref="Doubles"/> switches the kernels to the same values as doubles (the path of
/// a column read as doubles). Every method is reported per value (OperationsPerInvoke = events × 20) and runs on one
/// thread.
/// </summary>
[MemoryDiagnoser]
public class StreamBreakdownBenchmarks
{
    private const int Events = 1_000_000;
    private const int Features = 20;
    private const int Values = Events * Features;
    private string _folder = "";
    private string _path = "";
    private double[][][] _slices = []; // [slice][feature] values as doubles
    private float[][][] _floats = []; // [slice][feature] values as stored
    private Axis[] _axes = [];
    private Histogram[] _histograms = [];
    private ExactHistogram[] _exact = [];
    private FeatureStatistics[] _statistics = [];
    private int[] _cells = [];

    [GlobalSetup]
    public void Setup()
    {
        _folder = Directory.CreateTempSubdirectory("gatetasks-bench-stream-").FullName;
        _path = Path.Combine(_folder, "sample.parquet");
        SyntheticSampleWriter.WriteAsync(_path, Events, 2, seed: 5).GetAwaiter().GetResult();
        var slices = new List<double[][]>();
        using (var reader = ParquetSampleReader.Open(_path))
            foreach (var batch in reader.ReadBatches(SyntheticFeatures.Names))
                slices.Add(Enumerable.Range(0, Features).Select(c => batch.Column(c).ToArray()).ToArray());
        _slices = slices.ToArray();
        _floats = _slices.Select(s => s.Select(c => c.Select(v => (float)v).ToArray()).ToArray()).ToArray();
        _axes = Enumerable.Range(0, Features).Select(c =>
        {
            foreach (var (feature, bins, lower, upper) in SyntheticFeatures.RegularAxes)
                if (feature == c) return (Axis)new RegularAxis(bins, lower, upper);
            var sorted = _slices.SelectMany(s => s[c]).Order().ToArray();
            var edges = Enumerable.Range(0, 41).Select(k => sorted[Math.Min(sorted.Length - 1, (long)k * sorted.Length / 40)]).ToArray();
            edges[^1] = Math.BitIncrement(sorted[^1]);
            return Axis.FromEdges(edges);
        }).ToArray();
        _histograms = _axes.Select(a => new Histogram(a)).ToArray();
        _exact = _axes.Select(a => new ExactHistogram(a)).ToArray();
        _statistics = _axes.Select(_ => new FeatureStatistics()).ToArray();
        _cells = new int[ParquetSampleReader.SliceRows];
    }

    [Params(false, true)]
    public bool Doubles { get; set; }

    [GlobalCleanup]
    public void Cleanup() => Directory.Delete(_folder, recursive: true);

    [Benchmark(OperationsPerInvoke = Values)]
    public double Decode()
    {
        using var reader = ParquetSampleReader.Open(_path);
        var sum = 0.0;
        foreach (var batch in reader.ReadBatches(SyntheticFeatures.Names)) sum += batch.Float32Column(0)[batch.RowCount - 1];
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Values)]
    public double Convert()
    {
        using var reader = ParquetSampleReader.Open(_path);
        var sum = 0.0;
        foreach (var batch in reader.ReadBatches(SyntheticFeatures.Names))
            for (var c = 0; c < Features; c++) sum += batch.Column(c)[batch.RowCount - 1];
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Values)]
    public int Bin()
    {
        var sum = 0;
        for (var s = 0; s < _slices.Length; s++)
            for (var c = 0; c < Features; c++)
            {
                var n = _slices[s][c].Length;
                if (Doubles) _axes[c].Cells(_slices[s][c], _cells.AsSpan(0, n), _axes[c].Count + 2);
                else _axes[c].Cells(_floats[s][c], _cells.AsSpan(0, n), _axes[c].Count + 2);
                sum += _cells[0];
            }
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Values)]
    public double Fill()
    {
        for (var s = 0; s < _slices.Length; s++)
            for (var c = 0; c < Features; c++)
                if (Doubles) _histograms[c].Fill(_slices[s][c], ReadOnlySpan<double>.Empty);
                else _histograms[c].Fill(_floats[s][c]);
        return _histograms[0].SumW[1];
    }

    [Benchmark(OperationsPerInvoke = Values)]
    public long Moments()
    {
        for (var s = 0; s < _slices.Length; s++)
            for (var c = 0; c < Features; c++)
                if (Doubles) _statistics[c].Add(_slices[s][c], ReadOnlySpan<double>.Empty);
                else _statistics[c].Add(_floats[s][c]);
        return _statistics[0].Count;
    }

    [Benchmark(OperationsPerInvoke = Values)]
    public long Accumulate()
    {
        for (var s = 0; s < _slices.Length; s++)
            for (var c = 0; c < Features; c++)
                if (Doubles) AccumulateFeature(c, _slices[s][c]);
                else AccumulateFeature(c, _floats[s][c]);
        return _exact[0].Entries;
    }

    [Benchmark(OperationsPerInvoke = Values)]
    public long Stream()
    {
        using var reader = ParquetSampleReader.Open(_path);
        foreach (var batch in reader.ReadBatches(SyntheticFeatures.Names))
            for (var c = 0; c < Features; c++)
                if (Doubles) AccumulateFeature(c, batch.Column(c));
                else AccumulateFeature(c, batch.Float32Column(c));
        return _exact[0].Entries;
    }

    private void AccumulateFeature(int c, ReadOnlySpan<float> values)
    {
        _histograms[c].Fill(values);
        _exact[c].Absorb(_histograms[c]);
        _statistics[c].Add(values);
    }

    // As SampleAccumulation.Read does for a feature of this contract (no spike, far-tail or fine-grid counter).
    private void AccumulateFeature(int c, ReadOnlySpan<double> values)
    {
        _histograms[c].Fill(values, ReadOnlySpan<double>.Empty);
        _exact[c].Absorb(_histograms[c]);
        _statistics[c].Add(values, ReadOnlySpan<double>.Empty);
    }
}
