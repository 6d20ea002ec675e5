using GateTasks.Engine.Demo;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Samples;

public sealed class SampleProgressTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-progress-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private sealed class Recorder : IProgress<ReadProgress>
    {
        public List<ReadProgress> Reports { get; } = [];
        public void Report(ReadProgress value) => Reports.Add(value);
    }

    [Fact]
    public void Each_row_group_is_reported_against_the_total_the_parquet_footers_state()
    {
        // Two files of 25 000 rows in row groups of 10 000: five batches, then one closing report.
        var a = Path.Combine(_dir, "a.parquet");
        var b = Path.Combine(_dir, "b.parquet");
        DemoSampleWriter.Write(a, DemoScenarioParameters.FullSimulation, 25_000, 1, 10_000);
        DemoSampleWriter.Write(b, DemoScenarioParameters.FullSimulation, 25_000, 2, 10_000);
        var sample = Sample.Open([a, b]);
        Assert.Equal(50_000, sample.TotalRows);
        var recorder = new Recorder();
        foreach (var _ in sample.ReadBatches([DemoColumns.MassGg], new ReadPass("test pass", recorder))) { }
        Assert.Equal([10_000L, 20_000, 25_000, 35_000, 45_000, 50_000, 50_000], recorder.Reports.Select(r => r.RowsRead));
        Assert.All(recorder.Reports, r => Assert.Equal(50_000, r.RowsTotal));
        Assert.All(recorder.Reports, r => Assert.Equal("test pass", r.Phase));
        Assert.Equal([false, false, false, false, false, false, true], recorder.Reports.Select(r => r.Finished));
    }
}
