using System.IO.Compression;
using System.IO.Hashing;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples.Numpy;

/// <summary>
/// A NumPy <c>.npz</c> archive (a ZIP file of .npy members, as <c>numpy.savez</c> and <c>numpy.savez_compressed</c>
/// write it). Each plain 1-D member is one column named after the member (<c>pt.npy</c> gives <c>pt</c>); a structured
/// member gives its fields. Every member's header is read once when the file is opened. Each read streams the
/// members it needs side by side, a block of rows at a time: a stored member is read as it lies in the file, a
/// deflated one through the archive's decompressing stream, so memory stays bounded by the block whatever the
/// members' sizes. Each member's bytes are checked against the CRC-32 the archive records for it before its last
/// batch is handed out, so a member damaged after writing stops the pass (GATE2002) instead of reaching a verdict.
/// </summary>
internal sealed class NpzSampleReader : ISampleReader
{
    private sealed record Member(string EntryName, string Name, NpyHeader Header, IReadOnlyList<NpyColumn> Columns, uint Crc32);

    private readonly IReadOnlyList<Member> _members;
    // For each column: its member's index and the column within it.
    private readonly (int Member, NpyColumn Column)[] _sources;
    private readonly FileStamp _stamp;
    private readonly int _batchRows;

    private NpzSampleReader(string path, IReadOnlyList<Member> members, (int, NpyColumn)[] sources, FileStamp stamp, int batchRows)
    {
        Path = path;
        _members = members;
        _sources = sources;
        _stamp = stamp;
        _batchRows = batchRows;
        Columns = sources.Select(s => s.Item2.Column).ToArray();
        var lengths = members.Where(m => m.Header.Shape.Length == 1).Select(m => m.Header.Shape[0]).Distinct().ToArray();
        RowCount = lengths.Length == 1 ? lengths[0] : null;
    }

    /// <inheritdoc />
    public string Path { get; }

    /// <inheritdoc />
    public long? RowCount { get; }

    /// <inheritdoc />
    public IReadOnlyList<SampleColumn> Columns { get; }

    /// <inheritdoc />
    public long MetadataBytes => _members.Sum(m => m.Header.DataOffset);

    /// <summary>Opens <paramref name="path"/> and reads every member's header (GATE2012 to GATE2016, GATE2019 when it cannot be read as columns).</summary>
    /// <param name="path">The .npz file.</param>
    /// <param name="batchRows">Rows per batch at most.</param>
    public static NpzSampleReader Open(string path, int batchRows = NpySampleReader.BatchRows)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(batchRows, 1);
        var stamp = FileStamp.Of(path);
        var members = new List<Member>();
        using (var archive = OpenArchive(path))
            foreach (var entry in archive.Entries)
                members.Add(ReadMember(path, entry));
        if (members.Count == 0)
            throw new GateInputException(ErrorCodes.SampleNoColumns, $"sample file '{path}' is a .npz archive with no arrays in it", new SourceLocation(path));

        var sources = new List<(int, NpyColumn)>();
        var seen = new Dictionary<string, string>(StringComparer.Ordinal);
        for (var m = 0; m < members.Count; m++)
            foreach (var column in members[m].Columns)
            {
                if (!seen.TryAdd(column.Column.Name, members[m].EntryName))
                    throw new GateInputException(ErrorCodes.SampleUnreadable,
                        $"sample file '{path}': column '{column.Column.Name}' appears twice (in members '{seen[column.Column.Name]}' and '{members[m].EntryName}'); "
                        + "column names must be unique, or which column a feature reads is arbitrary",
                        new SourceLocation(path));
                sources.Add((m, column));
            }
        return new NpzSampleReader(path, members, sources.ToArray(), stamp, batchRows);
    }

    /// <inheritdoc />
    public IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns, int parallelism = 1)
    {
        var indices = SampleColumnLookup.IndicesOf(Path, Columns, columns);
        var used = indices.Select(i => _sources[i].Member).Distinct().Order().ToArray();
        // The requested columns must describe the same events: members of different lengths cannot be rows of one table.
        var first = _members[used[0]];
        foreach (var m in used)
            if (_members[m].Header.Shape[0] != first.Header.Shape[0])
                throw new GateInputException(ErrorCodes.SampleColumnLengths,
                    $"sample file '{Path}': member '{first.EntryName}' holds {first.Header.Shape[0]} rows but member '{_members[m].EntryName}' holds {_members[m].Header.Shape[0]}; "
                    + "the columns of a sample must have one length (one value per event)",
                    new SourceLocation(Path));
        var rows = used.Min(m => (int)Math.Clamp(PackedNumber.BlockBytes / Math.Max(1, _members[m].Header.Dtype.ItemSize), 1, _batchRows));
        return Batches(indices, used, rows, first.Header.Shape[0]);
    }

    /// <inheritdoc />
    public void Dispose()
    {
        // Each read opens its own file handles and closes them when enumeration ends; nothing is held between reads.
    }

    private IEnumerable<SampleBatch> Batches(int[] indices, int[] used, int batchRows, long total)
    {
        _stamp.RequireUnchanged(Path);
        var buffers = indices.Select(_ => new double[(int)Math.Min(batchRows, Math.Max(1, total))]).ToArray();
        var blocks = new Dictionary<int, byte[]>();
        var streams = new Dictionary<int, (ZipArchive Archive, Stream Data, Crc32 Crc)>();
        try
        {
            foreach (var m in used)
            {
                blocks[m] = new byte[checked(batchRows * (int)_members[m].Header.Dtype.ItemSize)];
                streams[m] = OpenData(m);
            }
            for (long start = 0; start < total; start += batchRows)
            {
                var rows = (int)Math.Min(batchRows, total - start);
                foreach (var m in used) ReadBlock(m, streams[m].Data, streams[m].Crc, blocks[m], rows, start, total);
                for (var c = 0; c < indices.Length; c++)
                {
                    var (m, column) = _sources[indices[c]];
                    var itemSize = (int)_members[m].Header.Dtype.ItemSize;
                    column.Field.Number!.Value.Decode(blocks[m], itemSize, (int)column.Field.Offset, buffers[c].AsSpan(0, rows));
                }
                var from = start;
                yield return new SampleBatch(buffers, rows)
                {
                    Locate = (row, column) => new CellOrigin(new SourceLocation(Path),
                        $"row {from + row + 1} (index {from + row}) of member '{_members[_sources[indices[column]].Member].EntryName}'",
                        InvariantNumber.Short(buffers[column][row])),
                };
            }
        }
        finally
        {
            foreach (var (archive, data, _) in streams.Values)
            {
                data.Dispose();
                archive.Dispose();
            }
        }
    }

    // A member's data, past its header: one archive (and file handle) per member, so members are read side by side.
    // The ZIP directory's CRC-32 of the member is recomputed over every byte read (the header's included).
    private (ZipArchive, Stream, Crc32) OpenData(int m)
    {
        var member = _members[m];
        var archive = OpenArchive(Path);
        try
        {
            var entry = archive.GetEntry(member.EntryName)
                        ?? throw SampleInputErrors.Unreadable(Path, $"member '{member.EntryName}' is gone; it changed after the sample was opened");
            var data = entry.Open();
            try
            {
                var skip = new byte[member.Header.DataOffset];
                if (data.ReadAtLeast(skip, skip.Length, throwOnEndOfStream: false) < skip.Length)
                    throw Truncated(member, 0, member.Header.Shape[0]);
                var crc = new Crc32();
                crc.Append(skip);
                return (archive, data, crc);
            }
            catch
            {
                data.Dispose();
                throw;
            }
        }
        catch (Exception ex) when (ex is InvalidDataException or IOException)
        {
            archive.Dispose();
            throw Damaged(member, ex);
        }
        catch
        {
            archive.Dispose();
            throw;
        }
    }

    private void ReadBlock(int m, Stream data, Crc32 crc, byte[] block, int rows, long start, long total)
    {
        var member = _members[m];
        var need = rows * (int)member.Header.Dtype.ItemSize;
        int got;
        try
        {
            got = data.ReadAtLeast(block.AsSpan(0, need), need, throwOnEndOfStream: false);
        }
        catch (Exception ex) when (ex is InvalidDataException or IOException)
        {
            throw Damaged(member, ex);
        }
        if (got < need) throw Truncated(member, start + got / member.Header.Dtype.ItemSize, total);
        crc.Append(block.AsSpan(0, need));
        // The member's last bytes are read before its last batch is handed out: a damaged member never reaches a verdict.
        if (start + rows == total && crc.GetCurrentHashAsUInt32() != member.Crc32)
            throw SampleInputErrors.Unreadable(Path,
                $"member '{member.EntryName}' fails the CRC-32 checksum its ZIP directory records ({member.Crc32:x8}; its bytes give {crc.GetCurrentHashAsUInt32():x8}): it was damaged after it was written");
    }

    private GateInputException Truncated(Member member, long row, long total) =>
        new(ErrorCodes.SampleArraySize,
            $"sample file '{Path}': member '{member.EntryName}' ends inside row {row + 1} of {total}: it is truncated",
            new SourceLocation(Path));

    private GateInputException Damaged(Member member, Exception ex) =>
        SampleInputErrors.Unreadable(Path, $"member '{member.EntryName}' is damaged ({SampleInputErrors.Describe(ex)})", ex);

    private static ZipArchive OpenArchive(string path)
    {
        var stream = SampleInputErrors.OpenRead(path, FileOptions.RandomAccess);
        try
        {
            return new ZipArchive(stream, ZipArchiveMode.Read, leaveOpen: false);
        }
        catch (Exception ex) when (ex is InvalidDataException or IOException)
        {
            stream.Dispose();
            throw new GateInputException(ErrorCodes.SampleArraySize,
                $"sample file '{path}' is a .npz archive whose ZIP directory cannot be read: it is truncated or damaged ({SampleInputErrors.Describe(ex)})",
                new SourceLocation(path), ex);
        }
    }

    private static Member ReadMember(string path, ZipArchiveEntry entry)
    {
        var what = $"member '{entry.FullName}' of sample file '{path}'";
        if (!entry.FullName.EndsWith(".npy", StringComparison.Ordinal))
            throw new GateInputException(ErrorCodes.SampleArrayHeader,
                $"{what} is not a NumPy array (a .npz archive holds only .npy members)", new SourceLocation(path));
        NpyHeader header;
        try
        {
            using var stream = entry.Open();
            header = NpyHeader.Read(stream, path, what);
        }
        catch (Exception ex) when (ex is InvalidDataException or IOException)
        {
            throw SampleInputErrors.Unreadable(path, $"member '{entry.FullName}' is damaged ({SampleInputErrors.Describe(ex)})", ex);
        }
        var name = entry.FullName[..^".npy".Length];
        IReadOnlyList<NpyColumn> columns;
        try
        {
            columns = NpyColumns.Of(header, name, path, $"member '{entry.FullName}'");
        }
        catch (GateInputException ex) when (ex.Code == ErrorCodes.SampleArrayShape)
        {
            // A member of another shape (a matrix, a scalar saved beside the columns) is refused only if a contract asks for it.
            var refusal = new ColumnRefusal(ex.Code, ex.Message);
            columns = [new NpyColumn(new SampleColumn(name, SampleValueType.Unsupported, false, refusal), header.Dtype.Fields[0])];
        }
        var expected = header.DataOffset + header.DataBytes;
        if (entry.Length != expected)
            throw new GateInputException(ErrorCodes.SampleArraySize,
                $"{what} holds {entry.Length} bytes, but its header ({header.Shape[0]} rows of {header.Dtype.ItemSize} bytes after a header of {header.DataOffset}) "
                + $"needs {expected}: {(entry.Length < expected ? "it is truncated" : "bytes were appended to it")}",
                new SourceLocation(path));
        return new Member(entry.FullName, name, header, columns, entry.Crc32);
    }
}
