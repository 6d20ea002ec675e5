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

    [Theory]
    [InlineData("s.npy", "PK\u0003\u0004", "a ZIP archive")]
    [InlineData("s.npz", "x,y\n", "does not start with that format's signature")]
    [InlineData("s.h5", "PAR1", "a Parquet file")]
    [InlineData("s.csv", "\u0093NUMPY", "a NumPy array")]
    [InlineData("s.parquet", "\u0089HDF\r\n\u001a\n", "an HDF5 file")]
    public void ContentThatIsNotTheExtensionsFormatIsRefused(string name, string head, string says)
    {
        var path = _folder.File(name);
        File.WriteAllBytes(path, [.. head.Select(c => (byte)c), .. new byte[64]]);

        var error = Assert.Throws<GateInputException>(() => SampleReaderFactory.Open(path));

        // docs/error-codes.md, GATE2017: the content does not match the extension.
        Assert.Equal(ErrorCodes.SampleContentMismatch, error.Code);
        Assert.Contains(says, error.Message);
        Assert.Equal(path, error.Location?.File);
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
