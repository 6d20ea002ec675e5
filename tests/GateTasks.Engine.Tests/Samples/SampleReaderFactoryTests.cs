using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Samples.Parquet;

namespace GateTasks.Engine.Tests.Samples;

public sealed class SampleReaderFactoryTests : IDisposable
{
    private readonly TemporaryFolder _folder = new();

    public void Dispose() => _folder.Dispose();

    [Theory]
    [InlineData("s.parquet")]
    [InlineData("s.pq")]
    [InlineData("S.PARQUET")]
    [InlineData("s.data")] // no known extension: recognised by the PAR1 signature
    public void OpensParquetByExtensionOrSignature(string name)
    {
        var path = _folder.File(name);
        ParquetFixture.Write(path, [new ParquetFixtureColumn<double>("x", [1, 2], v => v)], [2]);

        using var reader = SampleReaderFactory.Open(path);

        Assert.IsType<ParquetSampleReader>(reader);
        Assert.Equal(["x"], reader.Columns.Select(c => c.Name));
    }

    [Fact]
    public void OpensCsvByExtension()
    {
        var path = _folder.File("s.CSV");
        File.WriteAllText(path, "x\n1\n");

        using var reader = SampleReaderFactory.Open(path);

        Assert.IsType<CsvSampleReader>(reader);
    }

    [Fact]
    public void UnknownFormatIsUnreadable()
    {
        var path = _folder.File("notes.txt");
        File.WriteAllText(path, "x\n1\n");

        var error = Assert.Throws<GateInputException>(() => SampleReaderFactory.Open(path));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Contains(path, error.Message);
    }

    [Fact]
    public void MissingFileIsNotFound()
    {
        var path = Path.Combine(_folder.Path, "absent.csv");

        var error = Assert.Throws<GateInputException>(() => SampleReaderFactory.Open(path));

        Assert.Equal(ErrorCodes.SampleNotFound, error.Code);
        Assert.Equal(path, error.Location?.File);
    }
}
