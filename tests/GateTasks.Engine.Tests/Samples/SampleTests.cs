using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Samples;

public sealed class SampleTests : IDisposable
{
    private readonly TemporaryFolder _folder = new();

    public void Dispose() => _folder.Dispose();

    [Fact]
    public void ReadsTwoFilesInOrderAndCountsRowsAndBatches()
    {
        // File 1 written by ParquetSharp (two row groups), file 2 a CSV with the columns in another order.
        var first = _folder.File("part-1.parquet");
        ParquetFixture.Write(first,
            [new ParquetFixtureColumn<float>("pt", [1.5f, 2.5f, 3.5f], v => v), new ParquetFixtureColumn<int?>("n", [1, null, 3], v => v ?? double.NaN)],
            [2, 1]);
        var second = _folder.File("part-2.csv");
        File.WriteAllText(second, "n,extra,pt\n7,0,10.25\n,0,-1\n");

        var sample = Sample.Open(SampleFiles.Resolve(_folder.Path, _folder.Path));
        Assert.Equal([first, second], sample.Files);
        Assert.Equal(["pt", "n"], sample.Columns.Select(c => c.Name));

        var (values, batchRows) = SampleAssert.ReadAll(sample.ReadBatches(["pt", "n"]), 2);

        Assert.Equal([2, 1, 2], batchRows);
        SampleAssert.Identical([1.5, 2.5, 3.5, 10.25, -1], values[0], "pt");
        SampleAssert.Identical([1, double.NaN, 3, 7, double.NaN], values[1], "n");
        Assert.Equal(5, sample.RowsRead);
        Assert.Equal(3, sample.BatchesRead);
    }

    [Fact]
    public void ColumnMissingInOneFileNamesThatFileBeforeAnyDataIsRead()
    {
        var first = _folder.File("a.csv");
        File.WriteAllText(first, "pt,eta\n1,2\n");
        var second = _folder.File("b.csv");
        File.WriteAllText(second, "pt,Eta\n1,2\n");
        var sample = Sample.Open([first, second]);

        var error = Assert.Throws<GateInputException>(() => sample.ReadBatches(["pt", "eta"]));

        Assert.Equal(ErrorCodes.SampleColumnMissing, error.Code);
        Assert.Equal(second, error.Location?.File);
        Assert.Contains("did you mean 'Eta'?", error.Message);
        Assert.Contains("1 of the sample's 2 files has it", error.Message);
        Assert.Equal(["pt"], sample.Columns.Select(c => c.Name));
    }

    [Fact]
    public void EmptyFileListIsNotFound()
    {
        var error = Assert.Throws<GateInputException>(() => Sample.Open([]));

        Assert.Equal(ErrorCodes.SampleNotFound, error.Code);
    }

    [Fact]
    public void FileListedTwiceIsRefused()
    {
        var path = _folder.File("a.csv");
        File.WriteAllText(path, "pt\n1\n");

        var error = Assert.Throws<GateInputException>(() => Sample.Open([path, path]));

        Assert.Equal(ErrorCodes.Usage, error.Code);
    }

    [Fact]
    public void UnreadableFileFailsOnOpen()
    {
        var good = _folder.File("a.csv");
        File.WriteAllText(good, "pt\n1\n");
        var bad = _folder.File("b.parquet");
        File.WriteAllBytes(bad, [1, 2, 3]);

        var error = Assert.Throws<GateInputException>(() => Sample.Open([good, bad]));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Equal(bad, error.Location?.File);
    }
    // Two columns of equal size, written by ParquetSharp without dictionaries or compression, in the order given: swapping
    // them moves no chunk, so only the footer tells which column a chunk belongs to.
    private static void WriteTwoColumns(string path, bool swapped)
    {
        var a = new ParquetFixtureColumn<double>("a", [1, 2, 3], v => v);
        var b = new ParquetFixtureColumn<double>("b", [10, 20, 30], v => v);
        ParquetFixture.Write(path, swapped ? [b, a] : [a, b], [3],
            builder => builder.Compression(ParquetSharp.Compression.Uncompressed).DisableDictionary());
    }

    [Fact]
    public void AParquetFileRewrittenAfterOpeningIsRefusedNotReadWithTheFooterReadThen()
    {
        // The footer parsed when the sample is opened is used again to read it; a file rewritten in between (here with
        // its two columns swapped, every chunk where it was) would have column 'b' read as 'a'. Documented behaviour:
        // docs/error-codes.md, GATE2002.
        var path = _folder.File("a.parquet");
        WriteTwoColumns(path, swapped: false);
        var sample = Sample.Open([path]);
        WriteTwoColumns(path, swapped: true);

        var error = Assert.Throws<GateInputException>(() => SampleAssert.ReadAll(sample.ReadBatches(["a"]), 1));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Equal(path, error.Location?.File);
        Assert.Contains("changed after the sample was opened", error.Message);
    }

    [Fact]
    public void ACsvFileWhoseHeaderChangedAfterOpeningIsRefused()
    {
        // The header read when the sample is opened names the columns every pass reads (docs/error-codes.md, GATE2002).
        var path = _folder.File("a.csv");
        File.WriteAllText(path, "a,b\n1,10\n2,20\n");
        var sample = Sample.Open([path]);
        File.WriteAllText(path, "b,a\n10,1\n20,2\n");

        var error = Assert.Throws<GateInputException>(() => SampleAssert.ReadAll(sample.ReadBatches(["a"]), 1));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Contains("changed after the sample was opened", error.Message);
    }

    [Fact]
    public void FilesBeyondTheKeptMetadataAreOpenedAgainWhenRead()
    {
        // Compares the program with itself: with no metadata kept, every file is opened again when read, so the same
        // files give the same batches, and a file rewritten since opening is read as it is now (values written by
        // ParquetSharp above).
        var first = _folder.File("a.parquet");
        WriteTwoColumns(first, swapped: false);
        var second = _folder.File("b.parquet");
        WriteTwoColumns(second, swapped: true);
        var kept = SampleAssert.ReadAll(Sample.Open([first, second]).ReadBatches(["a", "b"]), 2);
        var reopened = Sample.Open([first, second], keptMetadataBytes: 0);
        WriteTwoColumns(first, swapped: true);

        var (values, batchRows) = SampleAssert.ReadAll(reopened.ReadBatches(["a", "b"]), 2);

        Assert.Equal(kept.BatchRows, batchRows);
        SampleAssert.Identical(kept.Columns[0], values[0], "a");
        SampleAssert.Identical(kept.Columns[1], values[1], "b");
        SampleAssert.Identical([1, 2, 3, 1, 2, 3], values[0], "a");
    }
}
