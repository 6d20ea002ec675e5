using System.IO.Compression;
using System.Runtime.InteropServices;
using Microsoft.Win32.SafeHandles;
using Parquet.Meta;

namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// Reads a flat numeric column chunk stored PLAIN (no dictionary) straight from the file into the caller's buffers,
/// page by page (data pages v1 and v2; uncompressed, Snappy, Zstandard or gzip). Its byte buffers are kept from
/// chunk to chunk and the file is read at positions, so reading allocates nothing per chunk and threads can share
/// one file handle. Parquet.Net reads the same chunks (the format is parquet-format's), but copies every page into
/// fresh arrays, which made the decoding memory-bound; anything this reader does not handle is declined and left to
/// Parquet.Net (the rule is stated where it is applied, in <see cref="ParquetColumnDecoder"/>). It reads the chunk's
/// bytes and page headers itself; what it knows of the chunk (offsets, codec, encodings) is the file metadata
/// Parquet.Net parsed from the footer.
/// </summary>
internal sealed class PlainChunkReader
{
    private const int PlainEncoding = 0, RleEncoding = 3, BitPackedEncoding = 4;

    private byte[] _chunk = [];
    private byte[] _page = [];
    private ZstdSharp.Decompressor? _zstd;

    /// <summary>Whether chunks of this column, stored as <paramref name="metadata"/> says, can be read here as <typeparamref name="T"/>.</summary>
    public static bool Supports<T>(ColumnMetaData metadata) where T : struct
    {
        if (!BitConverter.IsLittleEndian) return false; // PLAIN values are little-endian
        var physical = typeof(T) == typeof(float) ? global::Parquet.Meta.Type.FLOAT
            : typeof(T) == typeof(double) ? global::Parquet.Meta.Type.DOUBLE
            : typeof(T) == typeof(int) ? global::Parquet.Meta.Type.INT32
            : typeof(T) == typeof(long) ? global::Parquet.Meta.Type.INT64
            : (global::Parquet.Meta.Type?)null;
        return physical == metadata.Type
               && metadata.DictionaryPageOffset is null or 0
               && metadata.Encodings.All(e => (int)e is PlainEncoding or RleEncoding or BitPackedEncoding)
               && metadata.Codec is CompressionCodec.UNCOMPRESSED or CompressionCodec.SNAPPY or CompressionCodec.ZSTD or CompressionCodec.GZIP;
    }

    /// <summary>
    /// Reads the chunk of <paramref name="rows"/> rows: the non-null values densely into <paramref name="values"/>
    /// and, for a nullable column, one definition level per row into <paramref name="levels"/>. False when a page
    /// turns out to use something this reader declines (the buffers are then to be filled by another reader).
    /// <see cref="InvalidDataException"/> when the chunk is damaged.
    /// </summary>
    public bool TryRead<T>(SafeFileHandle file, ColumnMetaData metadata, int maxDefinitionLevel, int rows, Span<T> values, Span<int> levels)
        where T : unmanaged
    {
        var chunk = Load(file, metadata);
        var bitWidth = maxDefinitionLevel == 0 ? 0 : 32 - int.LeadingZeroCount(maxDefinitionLevel);
        int position = 0, decoded = 0, dense = 0, pageNumber = 1;
        while (decoded < rows)
        {
            if (position >= chunk.Length) break;
            var header = ParquetPageHeader.Read(chunk[position..], out var headerLength);
            position += headerLength;
            if (header.CompressedSize > chunk.Length - position)
                throw new InvalidDataException($"a page of {header.CompressedSize} bytes runs past its column chunk");
            var dataOffset = position;
            position += header.CompressedSize;
            VerifyChecksum(header, chunk.Slice(dataOffset, header.CompressedSize), pageNumber++);
            if (header.Type is ParquetPageHeader.IndexPage) continue;
            if (header.Type is not (ParquetPageHeader.DataPage or ParquetPageHeader.DataPageV2)) return false; // a dictionary page
            if (header.Encoding != PlainEncoding) return false;
            if (header.Values < 0 || header.Values > rows - decoded)
                throw new InvalidDataException($"a page holds {header.Values} values where {rows - decoded} rows remain");

            // A PLAIN page needs a few bytes a value; a header claiming far more is damaged, and is not believed
            // with a huge buffer.
            if (header.UncompressedSize > (long)header.Values * (Marshal.SizeOf<T>() + 8) + 4096)
                throw new InvalidDataException($"a page claims {header.UncompressedSize} bytes for {header.Values} values");
            // Stored as is, a page is as long as its header says both ways; a page cut short or run on into other
            // bytes is not (checked per page, not per value).
            if ((metadata.Codec == CompressionCodec.UNCOMPRESSED || (header.Type == ParquetPageHeader.DataPageV2 && !header.ValuesCompressed))
                && header.UncompressedSize != header.CompressedSize)
                throw new InvalidDataException(
                    $"page {pageNumber - 1} is stored uncompressed but its header gives {header.CompressedSize} bytes stored and {header.UncompressedSize} uncompressed");

            var size = Marshal.SizeOf<T>();
            if (header.Type == ParquetPageHeader.DataPage && maxDefinitionLevel == 0 && metadata.Codec != CompressionCodec.UNCOMPRESSED
                && (long)header.Values * size == header.UncompressedSize)
            {
                // A compressed page of a column without nulls holds nothing but its values: decompressed straight
                // into them, without a copy through the page buffer.
                DecompressInto(metadata.Codec, dataOffset, header.CompressedSize, MemoryMarshal.AsBytes(values.Slice(dense, header.Values)));
                dense += header.Values;
                decoded += header.Values;
                continue;
            }

            ReadOnlySpan<byte> levelBytes, valueBytes;
            if (header.Type == ParquetPageHeader.DataPage)
            {
                var page = Decompress(metadata.Codec, dataOffset, header.CompressedSize, header.UncompressedSize);
                var offset = 0;
                if (maxDefinitionLevel > 0)
                {
                    if (header.DefinitionLevelEncoding != RleEncoding) return false;
                    if (page.Length < 4) throw new InvalidDataException("a page is too short for its definition levels");
                    var levelLength = BitConverter.ToInt32(page[..4]);
                    if (levelLength < 0 || levelLength > page.Length - 4) throw new InvalidDataException("definition levels run past their page");
                    levelBytes = page.Slice(4, levelLength);
                    offset = 4 + levelLength;
                }
                else levelBytes = default;
                valueBytes = page[offset..];
            }
            else
            {
                if (header.RepetitionLevelsLength != 0) return false; // a flat column has none
                if (header.DefinitionLevelsLength > header.CompressedSize) throw new InvalidDataException("definition levels run past their page");
                levelBytes = chunk.Slice(dataOffset, header.DefinitionLevelsLength);
                var valuesOffset = dataOffset + header.DefinitionLevelsLength;
                var valuesLength = header.CompressedSize - header.DefinitionLevelsLength;
                valueBytes = header.ValuesCompressed
                    ? Decompress(metadata.Codec, valuesOffset, valuesLength, header.UncompressedSize - header.DefinitionLevelsLength)
                    : chunk.Slice(valuesOffset, valuesLength);
            }

            var present = header.Values;
            if (maxDefinitionLevel > 0)
            {
                var pageLevels = levels.Slice(decoded, header.Values);
                LevelRunDecoder.Decode(levelBytes, bitWidth, pageLevels);
                present = 0;
                foreach (var level in pageLevels)
                {
                    if (level == maxDefinitionLevel) present++;
                    else if ((uint)level > (uint)maxDefinitionLevel) throw new InvalidDataException($"definition level {level} above the column's {maxDefinitionLevel}");
                }
            }
            // PLAIN fixed-width values fill their page exactly: more bytes than the values need are as wrong as fewer.
            if ((long)present * size != valueBytes.Length)
                throw new InvalidDataException($"page {pageNumber - 1} holds {valueBytes.Length} bytes of values where its header's {present} values take {(long)present * size}");
            MemoryMarshal.Cast<byte, T>(valueBytes[..(present * size)]).CopyTo(values.Slice(dense, present));
            dense += present;
            decoded += header.Values;
        }
        if (decoded != rows) throw new InvalidDataException($"the column chunk holds {decoded} of its {rows} rows");
        // The chunk header's size must be what its pages take: bytes left over belong to no page of this column.
        if (position != chunk.Length)
            throw new InvalidDataException($"its pages take {position} of the {chunk.Length} bytes the column chunk header gives it");
        return true;
    }

    /// <summary>
    /// Verifies the CRC-32 of every page of a chunk that stores one (for chunks read by Parquet.Net, which does not),
    /// and that its pages hold as many values as the chunk header gives:
    /// a flipped bit in a page with a checksum is an <see cref="InvalidDataException"/>, never a changed value.
    /// </summary>
    public void VerifyChecksums(SafeFileHandle file, ColumnMetaData metadata)
    {
        var chunk = Load(file, metadata);
        long values = 0;
        for (int position = 0, pageNumber = 1; position < chunk.Length; pageNumber++)
        {
            var header = ParquetPageHeader.Read(chunk[position..], out var headerLength);
            position += headerLength;
            if (header.CompressedSize > chunk.Length - position)
                throw new InvalidDataException($"a page of {header.CompressedSize} bytes runs past its column chunk");
            VerifyChecksum(header, chunk.Slice(position, header.CompressedSize), pageNumber);
            position += header.CompressedSize;
            if (header.Type is ParquetPageHeader.DataPage or ParquetPageHeader.DataPageV2) values += Math.Max(0, header.Values);
        }
        // The pages' value counts must add up to the chunk header's (checked per page header, not per value).
        if (values != metadata.NumValues)
            throw new InvalidDataException($"its pages hold {values} values where the column chunk header gives {metadata.NumValues}");
    }

    // parquet-format: the CRC-32 (ISO-HDLC polynomial, as zlib computes it) of the page's bytes as stored.
    private static void VerifyChecksum(in ParquetPageHeader header, ReadOnlySpan<byte> stored, int pageNumber)
    {
        if (header.Crc is not { } expected) return;
        var actual = System.IO.Hashing.Crc32.HashToUInt32(stored);
        if (actual != expected)
            throw new InvalidDataException($"page {pageNumber} of the column chunk fails its CRC-32 checksum (stored {expected:x8}, computed {actual:x8}): the file was damaged after it was written");
    }

    /// <summary>Reads a column chunk's bytes into the reused buffer.</summary>
    private Span<byte> Load(SafeFileHandle file, ColumnMetaData metadata)
    {
        // A chunk starts at its dictionary page where it has one.
        var start = metadata.DictionaryPageOffset is > 0 and var d && d < metadata.DataPageOffset ? d : metadata.DataPageOffset;
        var length = metadata.TotalCompressedSize;
        if (start < 4 || length <= 0 || length > Array.MaxLength || start > RandomAccess.GetLength(file) - length)
            throw new InvalidDataException($"column chunk at byte {start} of {length} bytes lies outside the file");
        if (_chunk.Length < length) _chunk = new byte[length];
        var chunk = _chunk.AsSpan(0, (int)length);
        for (var read = 0; read < chunk.Length;)
        {
            var n = RandomAccess.Read(file, chunk[read..], start + read);
            if (n == 0) throw new InvalidDataException("the file ends inside a column chunk");
            read += n;
        }

        return chunk;
    }

    private ReadOnlySpan<byte> Decompress(CompressionCodec codec, int offset, int length, int uncompressed)
    {
        var source = _chunk.AsSpan(offset, length);
        if (codec == CompressionCodec.UNCOMPRESSED) return source;
        if (uncompressed < 0 || uncompressed > Array.MaxLength) throw new InvalidDataException($"a page claims {uncompressed} bytes uncompressed");
        if (_page.Length < uncompressed) _page = new byte[uncompressed];
        var target = _page.AsSpan(0, uncompressed);
        DecompressInto(codec, offset, length, target);
        return target;
    }

    // Decompresses a page's bytes from the chunk buffer into target, which they must fill exactly.
    private void DecompressInto(CompressionCodec codec, int offset, int length, Span<byte> target)
    {
        var source = _chunk.AsSpan(offset, length);
        var written = codec switch
        {
            CompressionCodec.SNAPPY => Snappier.Snappy.Decompress(source, target),
            CompressionCodec.ZSTD => (_zstd ??= new ZstdSharp.Decompressor()).Unwrap(source, target),
            _ => Gunzip(offset, length, target),
        };
        if (written != target.Length) throw new InvalidDataException($"a page decompressed to {written} bytes, not {target.Length}");
    }

    private int Gunzip(int offset, int length, Span<byte> target)
    {
        using var gzip = new GZipStream(new MemoryStream(_chunk, offset, length, writable: false), CompressionMode.Decompress);
        var total = 0;
        while (total < target.Length)
        {
            var n = gzip.Read(target[total..]);
            if (n == 0) break;
            total += n;
        }
        return total;
    }
}
