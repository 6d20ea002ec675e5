using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Samples.Parquet;
using ParquetSharp;

namespace GateTasks.Engine.Tests.Samples;

/// <summary>
/// Page CRC-32s as parquet-format defines them (the CRC of the page's bytes as stored, after its header), checked
/// against files whose checksums ParquetSharp 25.0.1.2 (Apache Arrow's C++ writer, EnablePageChecksum) computed:
/// an intact file must read as written, and a flipped bit in a checksummed page must be refused, never read.
/// </summary>
public sealed class PageChecksumTests : IDisposable
{
    private const int Rows = 3000;
    private readonly TemporaryFolder _folder = new();

    public void Dispose() => _folder.Dispose();

    public static TheoryData<Compression, bool, ParquetDataPageVersion> Layouts() => new()
    {
        { Compression.Uncompressed, false, ParquetDataPageVersion.V1 }, // the plain-chunk path
        { Compression.Snappy, false, ParquetDataPageVersion.V2 },       // the plain-chunk path, v2 pages
        { Compression.Snappy, true, ParquetDataPageVersion.V1 },        // dictionary pages: read by Parquet.Net
    };

    private string Write(Compression compression, bool dictionary, ParquetDataPageVersion pages, bool checksums)
    {
        var random = new Random(20261202);
        // Few distinct values so that a dictionary is worth writing where it is enabled.
        var values = Enumerable.Range(0, Rows).Select(_ => dictionary ? random.Next(20) * 0.5 : random.NextDouble()).ToArray();
        var path = _folder.File($"x-{compression}-{dictionary}-{pages}-{checksums}.parquet");
        ParquetFixture.Write(path, [new ParquetFixtureColumn<double>("x", values, v => v)], [Rows], b =>
        {
            b.Compression(compression).DataPageVersion(pages).DataPagesize(4096);
            if (dictionary) b.EnableDictionary(); else b.DisableDictionary();
            if (checksums) b.EnablePageChecksum(); else b.DisablePageChecksum();
        });
        return path;
    }

    private static double[] ReadAll(string path)
    {
        using var reader = ParquetSampleReader.Open(path);
        return SampleAssert.ReadAll(reader.ReadBatches(["x"]), 1).Columns[0];
    }

    /// <summary>Flips every bit of one byte a little way into the payload of the column's first data page.</summary>
    private static void FlipDataPageByte(string path)
    {
        var offset = ChunkOffsets(path).DataPage;
        var bytes = File.ReadAllBytes(path);
        ParquetPageHeader.Read(bytes.AsSpan((int)offset), out var headerLength);
        bytes[offset + headerLength + 12] ^= 0xFF;
        File.WriteAllBytes(path, bytes);
    }

    [Theory]
    [MemberData(nameof(Layouts))]
    public void Pages_checksummed_by_an_independent_writer_verify_and_read_as_written(Compression compression, bool dictionary, ParquetDataPageVersion pages)
    {
        var path = Write(compression, dictionary, pages, checksums: true);
        var plain = Write(compression, dictionary, pages, checksums: false);

        // The file really stores a CRC in its page headers (and the other does not).
        Assert.NotNull(FirstPageCrc(path));
        Assert.Null(FirstPageCrc(plain));
        SampleAssert.Identical(ReadAll(plain), ReadAll(path), "x");
    }

    [Theory]
    [MemberData(nameof(Layouts))]
    public void A_flipped_byte_in_a_checksummed_page_is_refused(Compression compression, bool dictionary, ParquetDataPageVersion pages)
    {
        var path = Write(compression, dictionary, pages, checksums: true);
        FlipDataPageByte(path);

        var error = Assert.Throws<GateInputException>(() => ReadAll(path));

        Assert.Equal(ErrorCodes.SampleUnreadable, error.Code);
        Assert.Contains("fails its CRC-32 checksum", error.Message);
        Assert.Equal(path, error.Location!.File);
    }

    [Fact]
    public void Without_checksums_a_flipped_value_byte_is_read_as_a_changed_value()
    {
        // The limit the documentation states: an uncompressed page without a CRC has nothing to check it against.
        var path = Write(Compression.Uncompressed, false, ParquetDataPageVersion.V1, checksums: false);
        var intact = ReadAll(path);
        FlipDataPageByte(path);
        var damaged = ReadAll(path);
        Assert.Equal(1, intact.Zip(damaged).Count(p => BitConverter.DoubleToInt64Bits(p.First) != BitConverter.DoubleToInt64Bits(p.Second)));
    }

    private static uint? FirstPageCrc(string path)
    {
        var (dictionaryPage, dataPage) = ChunkOffsets(path);
        var offset = dictionaryPage is > 0 and var d ? d : dataPage;
        var bytes = File.ReadAllBytes(path);
        return ParquetPageHeader.Read(bytes.AsSpan((int)offset), out _).Crc;
    }

    /// <summary>Where the column chunk's pages start, from the footer (ParquetSharp does not expose the offsets).</summary>
    private static (long? DictionaryPage, long DataPage) ChunkOffsets(string path)
    {
        var reader = Parquet.ParquetReader.CreateAsync(path).GetAwaiter().GetResult();
        try
        {
            using var rowGroup = reader.OpenRowGroupReader(0);
            var metadata = rowGroup.GetMetadata(reader.Schema.GetDataFields()[0])!.MetaData!;
            return (metadata.DictionaryPageOffset, metadata.DataPageOffset);
        }
        finally
        {
            reader.DisposeAsync().AsTask().GetAwaiter().GetResult();
        }
    }
}
