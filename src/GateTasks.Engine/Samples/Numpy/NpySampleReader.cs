using GateTasks.Engine.Diagnostics;
using Microsoft.Win32.SafeHandles;

namespace GateTasks.Engine.Samples.Numpy;

/// <summary>
/// A NumPy <c>.npy</c> file holding a structured array, whose field names are the columns. Its header is read once
/// when the file is opened; each read opens the file, checks it is unchanged (<see cref="FileStamp"/>) and reads a
/// block of whole records at a time at its offset (positioned reads, no memory map), decoding the requested fields
/// into reused buffers: memory is bounded by <see cref="PackedNumber.BlockBytes"/>, whatever the file's size.
/// </summary>
internal sealed class NpySampleReader : ISampleReader
{
    /// <summary>Rows per batch at most, as for the other formats.</summary>
    public const int BatchRows = 1 << 16;

    private readonly NpyHeader _header;
    private readonly IReadOnlyList<NpyColumn> _columns;
    private readonly FileStamp _stamp;
    private readonly int _batchRows;

    private NpySampleReader(string path, NpyHeader header, IReadOnlyList<NpyColumn> columns, FileStamp stamp, int batchRows)
    {
        Path = path;
        _header = header;
        _columns = columns;
        _stamp = stamp;
        _batchRows = batchRows;
        Columns = columns.Select(c => c.Column).ToArray();
    }

    /// <inheritdoc />
    public string Path { get; }

    /// <inheritdoc />
    public long? RowCount => _header.Shape[0];

    /// <inheritdoc />
    public IReadOnlyList<SampleColumn> Columns { get; }

    /// <inheritdoc />
    public long MetadataBytes => _header.DataOffset;

    /// <summary>Opens <paramref name="path"/> and reads its header (GATE2012, GATE2013, GATE2014, GATE2016 when it cannot be read as columns).</summary>
    /// <param name="path">The .npy file.</param>
    /// <param name="batchRows">Rows per batch at most.</param>
    public static NpySampleReader Open(string path, int batchRows = BatchRows)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(batchRows, 1);
        var stamp = FileStamp.Of(path);
        NpyHeader header;
        using (var stream = SampleInputErrors.OpenRead(path, FileOptions.SequentialScan))
        {
            try
            {
                header = NpyHeader.Read(stream, path, $"sample file '{path}'");
            }
            catch (IOException ex)
            {
                throw SampleInputErrors.Unreadable(path, SampleInputErrors.Describe(ex), ex);
            }
        }
        var what = $"sample file '{path}'";
        var columns = NpyColumns.Of(header, null, path, what);
        var expected = header.DataOffset + header.DataBytes;
        if (stamp.Length != expected)
            throw new GateInputException(ErrorCodes.SampleArraySize,
                $"{what} is {stamp.Length} bytes long, but its header ({header.Shape[0]} records of {header.Dtype.ItemSize} bytes after a header of {header.DataOffset}) "
                + $"needs {expected}: {(stamp.Length < expected ? "it is truncated" : "bytes were appended to it")}",
                new SourceLocation(path));
        var rows = (int)Math.Clamp(PackedNumber.BlockBytes / Math.Max(1, header.Dtype.ItemSize), 1, batchRows);
        return new NpySampleReader(path, header, columns, stamp, rows);
    }

    /// <inheritdoc />
    public IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns, int parallelism = 1)
    {
        var indices = SampleColumnLookup.IndicesOf(Path, Columns, columns);
        return Batches(indices);
    }

    /// <inheritdoc />
    public void Dispose()
    {
        // Each read opens its own file handle and closes it when enumeration ends; nothing is held between reads.
    }

    private IEnumerable<SampleBatch> Batches(int[] indices)
    {
        var itemSize = (int)_header.Dtype.ItemSize;
        var total = _header.Shape[0];
        var block = new byte[checked(_batchRows * itemSize)];
        var buffers = indices.Select(_ => new double[(int)Math.Min(_batchRows, Math.Max(1, total))]).ToArray();
        using var file = OpenUnchanged();
        for (long start = 0; start < total; start += _batchRows)
        {
            var rows = (int)Math.Min(_batchRows, total - start);
            var bytes = block.AsSpan(0, rows * itemSize);
            ReadAt(file, bytes, _header.DataOffset + start * itemSize, start, total);
            for (var c = 0; c < indices.Length; c++)
            {
                var field = _columns[indices[c]].Field;
                field.Number!.Value.Decode(bytes, itemSize, (int)field.Offset, buffers[c].AsSpan(0, rows));
            }
            var first = start;
            yield return new SampleBatch(buffers, rows)
            {
                Locate = (row, column) => new CellOrigin(new SourceLocation(Path), $"record {first + row + 1} (index {first + row})",
                    InvariantNumber.Short(buffers[column][row])),
            };
        }
    }

    private void ReadAt(SafeFileHandle file, Span<byte> into, long offset, long firstRow, long total)
    {
        int read;
        try
        {
            read = 0;
            while (read < into.Length)
            {
                var n = RandomAccess.Read(file, into[read..], offset + read);
                if (n == 0) break;
                read += n;
            }
        }
        catch (IOException ex)
        {
            throw SampleInputErrors.Unreadable(Path, SampleInputErrors.Describe(ex), ex);
        }
        if (read < into.Length)
            throw new GateInputException(ErrorCodes.SampleArraySize,
                $"sample file '{Path}' ends inside record {firstRow + read / _header.Dtype.ItemSize + 1} of {total}: it is truncated",
                new SourceLocation(Path));
    }

    private SafeFileHandle OpenUnchanged()
    {
        _stamp.RequireUnchanged(Path);
        try
        {
            return File.OpenHandle(Path, FileMode.Open, FileAccess.Read, FileShare.Read, FileOptions.RandomAccess);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or NotSupportedException or ArgumentException)
        {
            throw SampleInputErrors.OpenFailure(Path, ex);
        }
    }
}
