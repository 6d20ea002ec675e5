using GateTasks.Engine.Demo;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Tests.Demo;

public sealed class DemoSampleWriterTests : IDisposable
{
    private readonly string _directory = Directory.CreateTempSubdirectory("gatetasks-demo-").FullName;

    public void Dispose() => Directory.Delete(_directory, recursive: true);

    private string Write(string name, DemoScenarioParameters p, int events, int seed, int rowGroupSize)
    {
        var path = Path.Combine(_directory, name);
        DemoSampleWriter.Write(path, p, events, seed, rowGroupSize);
        return path;
    }

    [Fact]
    public void SameSeedGivesByteIdenticalFiles()
    {
        var first = Write("a.parquet", DemoScenarioParameters.FullSimulation, 30_000, 42, 10_000);
        var second = Write("b.parquet", DemoScenarioParameters.FullSimulation, 30_000, 42, 10_000);

        Assert.Equal(File.ReadAllBytes(first), File.ReadAllBytes(second));
    }

    [Fact]
    public void DifferentSeedGivesDifferentEvents()
    {
        var firstPath = Write("a.parquet", DemoScenarioParameters.FullSimulation, 5_000, 1, 5_000);
        var secondPath = Write("b.parquet", DemoScenarioParameters.FullSimulation, 5_000, 2, 5_000);
        Assert.NotEqual(File.ReadAllBytes(firstPath), File.ReadAllBytes(secondPath));

        var first = DemoParquetContent.Read(firstPath);
        var second = DemoParquetContent.Read(secondPath);
        var a = first.Columns[DemoColumns.MassGg];
        var b = second.Columns[DemoColumns.MassGg];
        Assert.True(a.Zip(b).Count(pair => pair.First == pair.Second) < 10);
    }

    [Fact]
    public void RowGroupsHaveTheRequestedSizeAndColumnsTheirTypes()
    {
        var content = DemoParquetContent.Read(Write("s.parquet", DemoScenarioParameters.FullSimulation, 25_000, 3, 10_000));

        Assert.Equal([10_000L, 10_000L, 5_000L], content.RowGroupSizes);
        Assert.Equal(DemoColumns.All, content.Fields.Select(f => f.Name));
        foreach (var field in content.Fields)
        {
            var expected = field.Name is DemoColumns.JetCount or DemoColumns.LeadConverted ? typeof(int) : typeof(float);
            Assert.Equal(expected, field.ClrType);
            Assert.False(field.IsNullable);
        }
    }

    [Fact]
    public void RowGroupSizeDoesNotChangeTheEvents()
    {
        // The event stream depends on the seed only, not on how it is cut into row groups.
        var coarse = DemoParquetContent.Read(Write("c.parquet", DemoScenarioParameters.Drifted, 12_000, 5, 12_000));
        var fine = DemoParquetContent.Read(Write("f.parquet", DemoScenarioParameters.Drifted, 12_000, 5, 5_000));

        Assert.Equal([12_000L], coarse.RowGroupSizes);
        Assert.Equal([5_000L, 5_000L, 2_000L], fine.RowGroupSizes);
        foreach (var name in DemoColumns.All)
        {
            Assert.Equal(coarse.Columns[name], fine.Columns[name]);
        }
    }

    [Fact]
    public void UnwritablePathIsReportedAsOutputNotWritable()
    {
        var path = Path.Combine(_directory, "no-such-directory", "s.parquet");

        var e = Assert.Throws<GateInputException>(() =>
            DemoSampleWriter.Write(path, DemoScenarioParameters.FullSimulation, 10, 1, 10));

        Assert.Equal(ErrorCodes.OutputNotWritable, e.Code);
        Assert.Contains(path, e.Message, StringComparison.Ordinal);
    }
}
