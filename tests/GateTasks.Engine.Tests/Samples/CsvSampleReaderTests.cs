using System.Globalization;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Samples;

public sealed class CsvSampleReaderTests : IDisposable
{
    private readonly TemporaryFolder _folder = new();

    public void Dispose() => _folder.Dispose();

    [Fact]
    public void RoundTripsDoublesWrittenWithRoundTripFormat()
    {
        // .NET's "R" format is documented to round-trip a double exactly; parsing it back must give the same bits.
        var rng = new Random(42);
        var a = Enumerable.Range(0, 300).Select(_ => (rng.NextDouble() - 0.5) * Math.Pow(10, rng.Next(-300, 300))).ToArray();
        var b = Enumerable.Range(0, 300).Select(_ => (double)(float)(rng.NextDouble() * 100)).ToArray();
        a[0] = double.MaxValue; a[1] = double.Epsilon; a[2] = -0.0; a[3] = 5e-324;
        var lines = new List<string> { "a,b" };
        lines.AddRange(a.Zip(b, (x, y) => x.ToString("R", CultureInfo.InvariantCulture) + "," + y.ToString("R", CultureInfo.InvariantCulture)));
        var path = _folder.File("round.csv");
        File.WriteAllText(path, string.Join("\r\n", lines) + "\r\n");

        using var reader = CsvSampleReader.Open(path, blockRows: 64);
        var (values, batchRows) = SampleAssert.ReadAll(reader.ReadBatches(["b", "a"]), 2);

        Assert.Equal([64, 64, 64, 64, 44], batchRows); // 300 rows in blocks of 64
        SampleAssert.Identical(b, values[0], "b");
        SampleAssert.Identical(a, values[1], "a");
    }

    [Fact]
    public void AcceptsMissingValuesNonFiniteSpellingsAndBooleans()
    {
        var path = _folder.File("special.csv");
        File.WriteAllText(path,
            "x, y ,z\n" +
            "1,,nan\n" +
            "NaN,inf,-inf\n" +
            "Infinity,-Infinity,+inf\n" +
            "true,false,TRUE\n" +
            "\" 2.5 \",  -3e2 ,1E-3\n" +
            "\n" + // a blank line is skipped
            "-0,0.1,\"7\"\n");

        using var reader = CsvSampleReader.Open(path);
        Assert.Equal(["x", "y", "z"], reader.Columns.Select(c => c.Name));
        Assert.All(reader.Columns, c => Assert.Equal(SampleValueType.Float64, c.Type));
        var (values, batchRows) = SampleAssert.ReadAll(reader.ReadBatches(["x", "y", "z"]), 3);

        Assert.Equal([6], batchRows);
        double inf = double.PositiveInfinity, nan = double.NaN;
        SampleAssert.Identical([1, nan, inf, 1, 2.5, -0.0], values[0], "x");
        SampleAssert.Identical([nan, inf, -inf, 0, -300, 0.1], values[1], "y");
        SampleAssert.Identical([nan, -inf, inf, 1, 0.001, 7], values[2], "z");
    }

    [Fact]
    public void NonNumericCellReportsLineFieldColumnAndValue()
    {
        var path = _folder.File("bad.csv");
        File.WriteAllText(path, "pt,eta,phi\n1,2,3\n\n\"4\",abc,6\n");
        using var reader = CsvSampleReader.Open(path);

        var error = Assert.Throws<GateInputException>(() => SampleAssert.ReadAll(reader.ReadBatches(["pt", "eta"]), 2));

        Assert.Equal(ErrorCodes.SampleCsvValue, error.Code);
        Assert.Equal(new SourceLocation(path, 4, 5), error.Location); // line 4 of the file (blank line 3 counted), character 5 (field 2, after a quoted field)
        Assert.Contains("'abc'", error.Message);
        Assert.Contains("column 'eta'", error.Message);
        Assert.Contains("field 2", error.Message);
        Assert.StartsWith($"{path}(4,5): error GATE2006:", error.ToDiagnosticLine());
    }

    [Fact]
    public void RecordWithWrongFieldCountIsUnreadableWithItsLine()
    {
        var path = _folder.File("ragged.csv");
        File.WriteAllText(path, "a,b\n1,2\n3\n");
        using var reader = CsvSampleReader.Open(path);

        var error = Assert.Throws<GateInputException>(() => SampleAssert.ReadAll(reader.ReadBatches(["a"]), 1));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Equal(3, error.Location?.Line);
    }

    [Fact]
    public void MissingColumnSuggestsNearestHeaderName()
    {
        var path = _folder.File("names.csv");
        File.WriteAllText(path, "jet_pt,jet_eta\n1,2\n");
        using var reader = CsvSampleReader.Open(path);

        var error = Assert.Throws<GateInputException>(() => reader.ReadBatches(["jet_phi", "jet_ptt"]));

        Assert.Equal(ErrorCodes.SampleColumnMissing, error.Code);
        Assert.Contains("'jet_phi'", error.Message);
        Assert.Contains(path, error.Message);
        Assert.Equal(path, error.Location?.File);
    }

    [Theory]
    [InlineData("", "empty")]
    [InlineData("1.0,2.0\n3,4\n", "header row is required")]
    [InlineData("a,a\n1,2\n", "appears twice")]
    public void BadHeaderIsUnreadable(string content, string expected)
    {
        var path = _folder.File("header.csv");
        File.WriteAllText(path, content);

        var error = Assert.Throws<GateInputException>(() => CsvSampleReader.Open(path));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Contains(expected, error.Message);
    }

    [Fact]
    public void HeaderOnlyFileHasNoBatches()
    {
        var path = _folder.File("header-only.csv");
        File.WriteAllText(path, "a,b\n");
        using var reader = CsvSampleReader.Open(path);

        Assert.Empty(reader.ReadBatches(["a", "b"]));
    }
}
