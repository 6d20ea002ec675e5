using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Samples.Parquet;
using ParquetSharp;

namespace GateTasks.Engine.Tests.Samples;

/// <summary>
/// The Parquet reader against files written by an independent implementation, ParquetSharp 25.0.1.2 (Apache Arrow's
/// C++ Parquet writer): every value must come back exactly as written, null as NaN, one batch per row group (up to a batch's size).
/// </summary>
public sealed class ParquetSampleReaderTests : IDisposable
{
    private static readonly int[] RowGroups = [1000, 777, 1];
    private readonly TemporaryFolder _folder = new();

    public void Dispose() => _folder.Dispose();

    public static TheoryData<Compression, bool, ParquetDataPageVersion> Layouts() => new()
    {
        { Compression.Snappy, true, ParquetDataPageVersion.V1 },
        { Compression.Snappy, false, ParquetDataPageVersion.V1 },
        { Compression.Zstd, true, ParquetDataPageVersion.V1 },
        { Compression.Zstd, false, ParquetDataPageVersion.V1 },
        { Compression.Gzip, true, ParquetDataPageVersion.V1 },
        { Compression.Uncompressed, false, ParquetDataPageVersion.V1 },
        { Compression.Snappy, true, ParquetDataPageVersion.V2 },
        { Compression.Zstd, false, ParquetDataPageVersion.V2 },
    };

    [Theory]
    [MemberData(nameof(Layouts))]
    public void ReadsEveryValueAsWritten(Compression compression, bool dictionary, ParquetDataPageVersion pages)
    {
        var path = _folder.File("mixed.parquet");
        var columns = MixedColumns(RowGroups.Sum(), lowCardinality: dictionary, seed: 20260101);
        ParquetFixture.Write(path, columns, RowGroups, b =>
        {
            b.Compression(compression).DataPageVersion(pages).DataPagesize(4096); // several pages per chunk
            if (dictionary) b.EnableDictionary(); else b.DisableDictionary();
        });

        // The file really has the layout under test (as ParquetSharp reports it).
        var layout = ParquetFixture.ChunkLayout(path);
        Assert.All(layout, chunk => Assert.Equal(compression, chunk.Compression));
        var dictionaryChunks = layout.Count(chunk =>
            chunk.Encodings.Contains(ParquetSharp.Encoding.RleDictionary) || chunk.Encodings.Contains(ParquetSharp.Encoding.PlainDictionary));
        if (dictionary) Assert.True(dictionaryChunks > 0); else Assert.Equal(0, dictionaryChunks);

        // Booleans in v2 pages are RLE-encoded, which the reader refuses (see BooleanColumnsWithRleValuesAreRefused).
        if (pages == ParquetDataPageVersion.V2) columns = columns.Where(c => !c.Name.StartsWith("flag", StringComparison.Ordinal)).ToArray();
        using var reader = ParquetSampleReader.Open(path);
        var names = columns.Select(c => c.Name).ToArray();
        var (values, batchRows) = SampleAssert.ReadAll(reader.ReadBatches(names), names.Length);

        Assert.Equal(RowGroups, batchRows); // one batch per row group
        for (var c = 0; c < columns.Length; c++)
        {
            var expected = Enumerable.Range(0, columns[c].Length).Select(columns[c].Expected).ToArray();
            SampleAssert.Identical(expected, values[c], columns[c].Name);
        }
    }

    public static TheoryData<Compression, ParquetDataPageVersion> PlainLayouts() => new()
    {
        { Compression.Snappy, ParquetDataPageVersion.V1 },
        { Compression.Snappy, ParquetDataPageVersion.V2 },
        { Compression.Zstd, ParquetDataPageVersion.V1 },
        { Compression.Zstd, ParquetDataPageVersion.V2 },
        { Compression.Gzip, ParquetDataPageVersion.V1 },
        { Compression.Gzip, ParquetDataPageVersion.V2 },
        { Compression.Uncompressed, ParquetDataPageVersion.V1 },
        { Compression.Uncompressed, ParquetDataPageVersion.V2 },
    };

    [Theory]
    [MemberData(nameof(PlainLayouts))]
    public async Task ThePlainChunkReaderTakesEveryPlainNumericChunkAndReadsItAsWritten(Compression compression, ParquetDataPageVersion pages)
    {
        // Not through the sample reader, which would fall back to Parquet.Net unnoticed: the plain-chunk reader
        // itself must accept every chunk of Arrow's writer here (several pages each) and give back what it wrote.
        var path = _folder.File("plain.parquet");
        var columns = MixedColumns(RowGroups.Sum(), lowCardinality: false, seed: 31)
            .Where(c => !c.Name.StartsWith("flag", StringComparison.Ordinal)).ToArray();
        ParquetFixture.Write(path, columns, RowGroups, b => b.Compression(compression).DataPageVersion(pages).DataPagesize(4096).DisableDictionary());

        await using var parquet = await Parquet.ParquetReader.CreateAsync(path);
        using var file = File.OpenHandle(path);
        var plain = new PlainChunkReader();
        var fields = parquet.Schema.GetDataFields();
        var first = 0;
        for (var g = 0; g < RowGroups.Length; g++)
        {
            var rows = RowGroups[g];
            using var rowGroup = parquet.OpenRowGroupReader(g);
            foreach (var column in columns)
            {
                var field = fields.Single(f => f.Name == column.Name);
                var metadata = rowGroup.GetMetadata(field)!.MetaData!;
                var expected = Enumerable.Range(first, rows).Select(column.Expected).ToArray();
                var got = field.ClrType == typeof(float) ? Read<float>(v => v)
                    : field.ClrType == typeof(double) ? Read<double>(v => v)
                    : field.ClrType == typeof(int) ? Read<int>(v => v)
                    : Read<long>(v => v);
                SampleAssert.Identical(expected, got, $"{column.Name}, row group {g + 1}");

                double[] Read<T>(Func<T, double> toDouble) where T : unmanaged
                {
                    Assert.True(PlainChunkReader.Supports<T>(metadata), $"{column.Name}: declined");
                    var values = new T[rows];
                    var levels = new int[rows];
                    Assert.True(plain.TryRead(file, metadata, field.MaxDefinitionLevel, rows, values.AsSpan(), levels.AsSpan()), $"{column.Name}: declined a page");
                    var next = 0;
                    return Enumerable.Range(0, rows).Select(r => field.MaxDefinitionLevel > 0 && levels[r] < field.MaxDefinitionLevel ? double.NaN : toDouble(values[next++])).ToArray();
                }
            }
            first += rows;
        }
    }

    [Fact]
    public async Task ThePlainChunkReaderDeclinesDictionaryChunks()
    {
        var path = _folder.File("dictionary.parquet");
        ParquetFixture.Write(path, MixedColumns(RowGroups.Sum(), lowCardinality: true, seed: 2), RowGroups, b => b.EnableDictionary());
        await using var parquet = await Parquet.ParquetReader.CreateAsync(path);
        using var rowGroup = parquet.OpenRowGroupReader(0);
        var field = parquet.Schema.GetDataFields().Single(f => f.Name == "f64");
        Assert.False(PlainChunkReader.Supports<double>(rowGroup.GetMetadata(field)!.MetaData!));
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(4)]
    public void LargeRowGroupsAreHandedOnInSlicesAndThreadsChangeNothing(int parallelism)
    {
        // Row groups larger than a batch, with nulls (so the dense values and the definition levels are walked
        // slice by slice), read with columns decoded side by side on 1, 2 or 4 threads.
        var path = _folder.File("large.parquet");
        int[] groups = [150_000, 70_000];
        var columns = MixedColumns(groups.Sum(), lowCardinality: false, seed: 77);
        ParquetFixture.Write(path, columns, groups, b => b.Compression(Compression.Snappy));

        using var reader = ParquetSampleReader.Open(path);
        var names = columns.Select(c => c.Name).ToArray();
        var (values, batchRows) = SampleAssert.ReadAll(reader.ReadBatches(names, parallelism), names.Length);

        const int slice = ParquetSampleReader.SliceRows;
        Assert.Equal([slice, slice, 150_000 - 2 * slice, slice, 70_000 - slice], batchRows);
        for (var c = 0; c < columns.Length; c++)
        {
            var expected = Enumerable.Range(0, columns[c].Length).Select(columns[c].Expected).ToArray();
            SampleAssert.Identical(expected, values[c], columns[c].Name);
        }
    }

    [Theory]
    [InlineData("flag")]
    [InlineData("flag_null")]
    public void BooleanColumnsWithRleValuesAreRefusedNotMisread(string column)
    {
        // Arrow's writer stores booleans RLE-encoded in data page v2; Parquet.Net 6.1.0 misreads those values
        // (checked against ParquetSharp's own read-back of the same file), so the reader must refuse, not guess.
        var path = _folder.File("v2-bool.parquet");
        ParquetFixture.Write(path, MixedColumns(RowGroups.Sum(), false, 3), RowGroups, b => b.DataPageVersion(ParquetDataPageVersion.V2));
        using var reader = ParquetSampleReader.Open(path);

        var error = Assert.Throws<GateInputException>(() => SampleAssert.ReadAll(reader.ReadBatches([column]), 1));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Contains($"boolean column '{column}'", error.Message);
        Assert.Contains("RLE", error.Message);
    }

    [Fact]
    public void ReportsSchemaInFileOrder()
    {
        var path = _folder.File("schema.parquet");
        var columns = MixedColumns(10, lowCardinality: false, seed: 1);
        ParquetFixture.Write(path, columns, [10]);

        using var reader = ParquetSampleReader.Open(path);

        Assert.Equal(path, reader.Path);
        Assert.Equal(
            [
                new SampleColumn("f32", SampleValueType.Float32, false),
                new SampleColumn("f64", SampleValueType.Float64, false),
                new SampleColumn("i32", SampleValueType.Int32, false),
                new SampleColumn("i64", SampleValueType.Int64, false),
                new SampleColumn("flag", SampleValueType.Boolean, false),
                new SampleColumn("f32_null", SampleValueType.Float32, true),
                new SampleColumn("f64_null", SampleValueType.Float64, true),
                new SampleColumn("i32_null", SampleValueType.Int32, true),
                new SampleColumn("i64_null", SampleValueType.Int64, true),
                new SampleColumn("flag_null", SampleValueType.Boolean, true),
                new SampleColumn("all_null", SampleValueType.Float64, true),
            ],
            reader.Columns);
    }

    [Fact]
    public void ReadsSmallAndUnsignedIntegersExactly()
    {
        var path = _folder.File("integers.parquet");
        ParquetFixtureColumn[] columns =
        [
            new ParquetFixtureColumn<sbyte>("i8", [sbyte.MinValue, -1, 0, 1, sbyte.MaxValue], v => v),
            new ParquetFixtureColumn<short>("i16", [short.MinValue, -1, 0, 1, short.MaxValue], v => v),
            new ParquetFixtureColumn<byte>("u8", [0, 1, 2, 254, byte.MaxValue], v => v),
            new ParquetFixtureColumn<ushort>("u16", [0, 1, 2, 65534, ushort.MaxValue], v => v),
            new ParquetFixtureColumn<uint>("u32", [0, 1, 2, 4_000_000_000, uint.MaxValue], v => v),
            new ParquetFixtureColumn<ulong>("u64", [0, 1, 1UL << 53, (1UL << 63) + 1, ulong.MaxValue], v => v),
            new ParquetFixtureColumn<sbyte?>("i8_null", [null, -7, null, 7, null], v => v ?? double.NaN),
            new ParquetFixtureColumn<ulong?>("u64_null", [ulong.MaxValue, null, null, 3, null], v => v ?? double.NaN),
        ];
        ParquetFixture.Write(path, columns, [2, 3]);

        using var reader = ParquetSampleReader.Open(path);
        Assert.Equal(
            [SampleValueType.Int8, SampleValueType.Int16, SampleValueType.UInt8, SampleValueType.UInt16,
             SampleValueType.UInt32, SampleValueType.UInt64, SampleValueType.Int8, SampleValueType.UInt64],
            reader.Columns.Select(c => c.Type));
        var names = columns.Select(c => c.Name).ToArray();
        var (values, batchRows) = SampleAssert.ReadAll(reader.ReadBatches(names), names.Length);

        Assert.Equal([2, 3], batchRows);
        for (var c = 0; c < columns.Length; c++)
            SampleAssert.Identical(Enumerable.Range(0, 5).Select(columns[c].Expected).ToArray(), values[c], names[c]);
    }

    [Fact]
    public void ReportsNonNumericColumnsAsUnsupportedAndRefusesToReadThem()
    {
        var path = _folder.File("other-types.parquet");
        ParquetFixtureColumn[] columns =
        [
            new ParquetFixtureColumn<double>("pt", [1, 2], v => v),
            new ParquetFixtureColumn<string>("label", ["a", "b"], _ => double.NaN),
            new ParquetFixtureColumn<DateTime>("when", [DateTime.UnixEpoch, DateTime.UnixEpoch], _ => double.NaN),
            new ParquetFixtureColumn<int[]>("hits", [[1, 2], [3]], _ => double.NaN),
        ];
        ParquetFixture.Write(path, columns, [2]);

        using var reader = ParquetSampleReader.Open(path);

        Assert.Equal(
            [SampleValueType.Float64, SampleValueType.Unsupported, SampleValueType.Unsupported, SampleValueType.Unsupported],
            reader.Columns.Select(c => c.Type));
        Assert.Equal(["pt", "label", "when", "hits"], reader.Columns.Select(c => c.Name));
        var error = Assert.Throws<GateInputException>(() => reader.ReadBatches(["pt", "label"]));
        Assert.Equal(ErrorCodes.SampleColumnType, error.Code);
        Assert.Contains("'label'", error.Message);
        Assert.Equal(path, error.Location?.File);
        // The numeric column next to them still reads.
        var (values, _) = SampleAssert.ReadAll(reader.ReadBatches(["pt"]), 1);
        Assert.Equal([1.0, 2.0], values[0]);
    }

    [Fact]
    public void MissingColumnNamesFileAndNearestName()
    {
        var path = _folder.File("missing.parquet");
        ParquetFixture.Write(path, [new ParquetFixtureColumn<double>("pt", [1], v => v), new ParquetFixtureColumn<double>("eta", [2], v => v)], [1]);
        using var reader = ParquetSampleReader.Open(path);

        var error = Assert.Throws<GateInputException>(() => reader.ReadBatches(["eta", "ptt"]));

        Assert.Equal(ErrorCodes.SampleColumnMissing, error.Code);
        Assert.Contains("'ptt'", error.Message);
        Assert.Contains(path, error.Message);
        Assert.Contains("did you mean 'pt'?", error.Message);
        Assert.Equal(new SourceLocation(path), error.Location);
    }

    [Fact]
    public void RequestedColumnsComeBackInRequestOrderAndMayRepeat()
    {
        var path = _folder.File("order.parquet");
        ParquetFixture.Write(path,
            [new ParquetFixtureColumn<double>("a", [1, 2], v => v), new ParquetFixtureColumn<int>("b", [10, 20], v => v)], [2]);
        using var reader = ParquetSampleReader.Open(path);

        var (values, _) = SampleAssert.ReadAll(reader.ReadBatches(["b", "a", "b"]), 3);

        Assert.Equal([10.0, 20.0], values[0]);
        Assert.Equal([1.0, 2.0], values[1]);
        Assert.Equal([10.0, 20.0], values[2]);
    }

    [Theory]
    [InlineData(1)]
    [InlineData(8)]
    [InlineData(200)]
    [InlineData(-1)] // keep only the first half
    public void TruncatedFileIsUnreadableNotACrash(int cut)
    {
        var path = _folder.File("whole.parquet");
        ParquetFixture.Write(path, MixedColumns(RowGroups.Sum(), false, 7), RowGroups, b => b.Compression(Compression.Snappy));
        var bytes = File.ReadAllBytes(path);
        var keep = cut < 0 ? bytes.Length / 2 : bytes.Length - cut;
        var truncated = _folder.File("truncated.parquet");
        File.WriteAllBytes(truncated, bytes[..keep]);

        var error = Assert.Throws<GateInputException>(() => ReadEverything(truncated));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Contains(truncated, error.Message);
        Assert.Equal(truncated, error.Location?.File);
        Assert.DoesNotContain("   at ", error.Message); // one line, no stack trace
    }

    [Fact]
    public void DamagedDataPagesAreUnreadableNotACrash()
    {
        var path = _folder.File("damaged.parquet");
        ParquetFixture.Write(path, MixedColumns(RowGroups.Sum(), false, 11), RowGroups, b => b.Compression(Compression.Snappy));
        var bytes = File.ReadAllBytes(path);
        // Scramble the first data pages but keep the footer, so the file opens and fails while decoding.
        new Random(5).NextBytes(bytes.AsSpan(4, bytes.Length / 4));
        File.WriteAllBytes(path, bytes);

        var error = Assert.Throws<GateInputException>(() => ReadEverything(path));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Contains(path, error.Message);
    }

    public static TheoryData<string> NotParquet() => new() { "random", "magic-only", "magic-around-random", "empty" };

    [Theory]
    [MemberData(nameof(NotParquet))]
    public void NonParquetBytesAreUnreadable(string kind)
    {
        var path = _folder.File(kind + ".parquet");
        var random = new byte[4096];
        new Random(3).NextBytes(random);
        byte[] content = kind switch
        {
            "random" => random,
            "magic-only" => "PAR1"u8.ToArray(),
            "magic-around-random" => [.. "PAR1"u8, .. random, .. BitConverter.GetBytes(100), .. "PAR1"u8],
            _ => [],
        };
        File.WriteAllBytes(path, content);

        var error = Assert.Throws<GateInputException>(() => ReadEverything(path));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Contains(path, error.Message);
    }

    [Fact]
    public void MissingFileIsNotFound()
    {
        var path = System.IO.Path.Combine(_folder.Path, "absent.parquet");

        var error = Assert.Throws<GateInputException>(() => ParquetSampleReader.Open(path));

        Assert.Equal(ErrorCodes.SampleNotFound, error.Code);
    }

    private static void ReadEverything(string path)
    {
        using var reader = ParquetSampleReader.Open(path);
        var numeric = reader.Columns.Where(c => c.Type != SampleValueType.Unsupported).Select(c => c.Name).ToArray();
        foreach (var _ in reader.ReadBatches(numeric))
        {
        }
    }

    /// <summary>
    /// Float, double, int32, int64 and bool columns, plain and nullable (nulls scattered and in runs), with the edge
    /// values of each type first. Low cardinality makes the writer keep dictionary encoding.
    /// </summary>
    private static ParquetFixtureColumn[] MixedColumns(int rows, bool lowCardinality, int seed)
    {
        var rng = new Random(seed);
        float[] floatEdges = [float.MaxValue, float.MinValue, float.Epsilon, -0.0f, float.NaN, float.PositiveInfinity, float.NegativeInfinity];
        double[] doubleEdges = [double.MaxValue, double.MinValue, double.Epsilon, -0.0, double.NaN, double.PositiveInfinity, double.NegativeInfinity];
        int[] intEdges = [int.MinValue, int.MaxValue, 0, -1];
        long[] longEdges = [long.MinValue, long.MaxValue, (1L << 53) + 1, -1];

        T[] Make<T>(T[] edges, Func<T> next) =>
            Enumerable.Range(0, rows).Select(i => i < edges.Length ? edges[i] : next()).ToArray();
        bool IsNull(int i) => i % 5 == 1 || (i >= 40 && i < 140); // scattered and a run across a page boundary
        T?[] WithNulls<T>(T[] values) where T : struct =>
            values.Select((v, i) => IsNull(i) ? (T?)null : v).ToArray();

        var f32 = Make(floatEdges, () => lowCardinality ? rng.Next(16) * 0.125f : (float)(rng.NextDouble() * 2e3 - 1e3));
        var f64 = Make(doubleEdges, () => lowCardinality ? rng.Next(16) * 0.1 : rng.NextDouble() * 2e6 - 1e6);
        var i32 = Make(intEdges, () => lowCardinality ? rng.Next(-8, 8) : rng.Next(int.MinValue, int.MaxValue));
        var i64 = Make(longEdges, () => lowCardinality ? rng.Next(20) * 1_000_000_007L : rng.NextInt64(long.MinValue, long.MaxValue));
        var flag = Make([true, false], () => rng.Next(2) == 1);

        return
        [
            new ParquetFixtureColumn<float>("f32", f32, v => v),
            new ParquetFixtureColumn<double>("f64", f64, v => v),
            new ParquetFixtureColumn<int>("i32", i32, v => v),
            new ParquetFixtureColumn<long>("i64", i64, v => v),
            new ParquetFixtureColumn<bool>("flag", flag, v => v ? 1 : 0),
            new ParquetFixtureColumn<float?>("f32_null", WithNulls(f32), v => v ?? double.NaN),
            new ParquetFixtureColumn<double?>("f64_null", WithNulls(f64), v => v ?? double.NaN),
            new ParquetFixtureColumn<int?>("i32_null", WithNulls(i32), v => v ?? double.NaN),
            new ParquetFixtureColumn<long?>("i64_null", WithNulls(i64), v => v ?? double.NaN),
            new ParquetFixtureColumn<bool?>("flag_null", WithNulls(flag), v => v is null ? double.NaN : v.Value ? 1 : 0),
            new ParquetFixtureColumn<double?>("all_null", new double?[rows], v => v ?? double.NaN),
        ];
    }
}
