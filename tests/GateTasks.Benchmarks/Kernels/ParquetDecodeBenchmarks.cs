using BenchmarkDotNet.Attributes;
using GateTasks.Benchmarks.Harness;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Samples.Parquet;

namespace GateTasks.Benchmarks.Kernels;

/// <summary>
/// <see cref="ParquetSampleReader"/> decoding Snappy-compressed float32 columns into the engine's double batches:
/// one column or all 20 of the benchmark sample, 400 000 events in 4 row groups. Reported per event.
/// </summary>
[MemoryDiagnoser]
public class ParquetDecodeBenchmarks
{
    private const int Events = 400_000;
    private string _folder = "";
    private string _path = "";
    private IReadOnlyList<string> _columns = [];

    [Params(1, 20)]
    public int Columns { get; set; }

    [GlobalSetup]
    public void Setup()
    {
        _folder = Directory.CreateTempSubdirectory("gatetasks-bench-decode-").FullName;
        _path = Path.Combine(_folder, "sample.parquet");
        SyntheticSampleWriter.WriteAsync(_path, Events, 4, seed: 11).GetAwaiter().GetResult();
        _columns = SyntheticFeatures.Names.Take(Columns).ToArray();
    }

    [GlobalCleanup]
    public void Cleanup() => Directory.Delete(_folder, recursive: true);

    [Benchmark(OperationsPerInvoke = Events)]
    public double Decode()
    {
        using var reader = ParquetSampleReader.Open(_path);
        var sum = 0.0;
        foreach (var batch in reader.ReadBatches(_columns)) sum += batch.Column(0)[batch.RowCount - 1];
        return sum;
    }
}
