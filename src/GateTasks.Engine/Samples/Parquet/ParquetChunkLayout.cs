using System.Buffers.Binary;
using Parquet.Meta;

namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// Checks where a Parquet footer places the column chunks against the file itself, from the footer alone: every
/// chunk lies between the leading signature and the footer, and no two chunks share a byte. A file that lost bytes
/// before its footer (a page cut short in transfer or by a crashed copy) keeps a valid footer whose offsets now
/// point past the data; without a page checksum, the chunk that lost them would be read on into the next column's
/// bytes as if they were its own values. Where bytes are missing, or unused bytes lie between the chunks (a writer's
/// padding, or bytes added), the first page header of each chunk is read, in file order, to name the chunk that
/// changed length: the first chunk that no longer starts with a page header is the one after it.
/// </summary>
/// <remarks>Layout: Apache Parquet format specification (parquet-format, "File format", ColumnMetaData offsets).</remarks>
internal static class ParquetChunkLayout
{
    private const int HeaderProbeBytes = 4096;

    private readonly record struct Chunk(int RowGroup, string Column, long Start, long Length, ColumnMetaData Metadata)
    {
        public long End => Start + Length;
    }

    /// <summary>What is wrong with the chunk layout of the file at <paramref name="stream"/>, or null when it is sound.</summary>
    public static string? Problem(Stream stream, FileMetaData metadata)
    {
        var footerStart = FooterStart(stream);
        var groups = metadata.RowGroups?.Count ?? 0;
        var chunks = new List<Chunk>();
        long dataEnd = 0; // where the last thing the footer places before itself ends: a chunk, a page index or a Bloom filter
        for (var g = 0; g < groups; g++)
            foreach (var column in metadata.RowGroups![g].Columns ?? [])
            {
                if (column.MetaData is not { } m || column.FilePath is not null) continue; // a chunk kept in another file is not read
                dataEnd = Math.Max(dataEnd, End(column.OffsetIndexOffset, column.OffsetIndexLength));
                dataEnd = Math.Max(dataEnd, End(column.ColumnIndexOffset, column.ColumnIndexLength));
                dataEnd = Math.Max(dataEnd, End(m.BloomFilterOffset, m.BloomFilterLength));
                var start = m.DictionaryPageOffset is > 0 and var d && d < m.DataPageOffset ? d : m.DataPageOffset;
                var chunk = new Chunk(g, string.Join('.', m.PathInSchema ?? []), start, m.TotalCompressedSize, m);
                if (start < 4 || chunk.Length <= 0 || chunk.End < start)
                    return $"{Where(chunk, groups)}, is damaged (the footer places its chunk at byte {start}, {chunk.Length} bytes long)";
                chunks.Add(chunk);
                dataEnd = Math.Max(dataEnd, chunk.End);
            }
        chunks.Sort((a, b) => a.Start.CompareTo(b.Start));
        var gaps = false;
        for (var i = 1; i < chunks.Count; i++)
        {
            if (chunks[i].Start < chunks[i - 1].End)
                return $"{Where(chunks[i - 1], groups)}, is damaged (the footer places its chunk, bytes {chunks[i - 1].Start} to {chunks[i - 1].End}, "
                       + $"over that of {Where(chunks[i], groups)}, from byte {chunks[i].Start}: two columns cannot share bytes)";
            gaps |= chunks[i].Start > chunks[i - 1].End;
        }
        if (chunks.Count == 0) return null;

        if (dataEnd > footerStart)
        {
            var missing = dataEnd - footerStart;
            var (lost, next) = Shifted(stream, chunks) is { } shifted ? (chunks[shifted - 1], chunks[shifted]) : (chunks[^1], (Chunk?)null);
            return $"{Where(lost, groups)}, is damaged: a page of it was cut short (at least {missing} bytes are missing: the footer places "
                   + $"data up to byte {dataEnd}, but the footer itself begins at byte {footerStart}"
                   + (next is { } n ? $", and the next chunk, {Where(n, groups)}, no longer starts with a page header at byte {n.Start})" : ")")
                   + "; its values would be read from other bytes, so the file is refused";
        }
        // Unused bytes between chunks or before the footer may be a writer's padding, or bytes added inside a page:
        // only then are the chunks' first page headers read (a file written without gaps costs nothing more).
        if ((gaps || dataEnd < footerStart) && Shifted(stream, chunks) is { } moved)
            return $"{Where(chunks[moved - 1], groups)}, is damaged: the next chunk, {Where(chunks[moved], groups)}, does not start with a page header "
                   + $"at byte {chunks[moved].Start}, where the footer places it, so bytes were added to or lost from the chunk before it; "
                   + "its values would be read from other bytes, so the file is refused";
        return null;
    }

    private static long End(long? offset, int? length) => offset is > 0 and var o && length is > 0 and var l ? o + l : 0;

    private static string Where(Chunk c, int groups) => $"row group {c.RowGroup + 1} of {groups}, column '{c.Column}'";

    // The footer's length sits in the 4 bytes before the trailing signature (checked by ParquetFooterCheck).
    private static long FooterStart(Stream stream)
    {
        Span<byte> tail = stackalloc byte[8];
        var position = stream.Position;
        stream.Position = stream.Length - 8;
        stream.ReadExactly(tail);
        stream.Position = position;
        return stream.Length - 8 - BinaryPrimitives.ReadInt32LittleEndian(tail);
    }

    // Bytes lost or added before the footer move every chunk after them away from where the footer says it starts,
    // so the first chunk (after the first) whose offset holds no sound page header follows the one that changed
    // length: its index, or null when every chunk starts with a page header.
    private static int? Shifted(Stream stream, List<Chunk> chunks)
    {
        var probe = new byte[HeaderProbeBytes];
        var position = stream.Position;
        try
        {
            for (var i = 1; i < chunks.Count; i++)
                if (!StartsWithPageHeader(stream, chunks[i], probe)) return i;
            return null;
        }
        finally
        {
            stream.Position = position;
        }
    }

    private static bool StartsWithPageHeader(Stream stream, Chunk chunk, byte[] probe)
    {
        if (chunk.Start >= stream.Length) return false;
        stream.Position = chunk.Start;
        var read = stream.ReadAtLeast(probe, probe.Length, throwOnEndOfStream: false);
        try
        {
            var header = ParquetPageHeader.Read(probe.AsSpan(0, read), out var length);
            return header.Type is ParquetPageHeader.DataPage or ParquetPageHeader.IndexPage or ParquetPageHeader.DictionaryPage or ParquetPageHeader.DataPageV2
                   && header.CompressedSize <= chunk.Length - length
                   && header.Values <= chunk.Metadata.NumValues;
        }
        catch (InvalidDataException)
        {
            return false;
        }
        catch (OverflowException)
        {
            return false;
        }
    }
}
