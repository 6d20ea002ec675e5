using GateTasks.Engine.Diagnostics;
using Parquet;
using Parquet.Schema;

namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// Reads a Parquet sample file with Parquet.Net a row group at a time, handed out in batches of at most
/// <see cref="SliceRows"/> rows. Only the footer is read on opening; data is read column chunk by column chunk as
/// batches are requested.
/// </summary>
/// <remarks>
/// Parquet.Net is asynchronous; its calls are awaited synchronously, which is safe for the console and MSBuild
/// hosts (no synchronisation context to deadlock on).
/// </remarks>
internal sealed class ParquetSampleReader : ISampleReader
{
    /// <summary>
    /// Rows per batch: a row group is decoded whole in its stored types, then converted to doubles and handed on in
    /// slices of this many rows, so the double buffers stay at a few megabytes however large the row groups are.
    /// </summary>
    internal const int SliceRows = 1 << 16;

    private readonly ParquetReader _reader;
    private readonly DataField?[] _fields;

    private ParquetSampleReader(string path, ParquetReader reader, IReadOnlyList<SampleColumn> columns, DataField?[] fields, int parallelism)
    {
        Path = path;
        Parallelism = Math.Max(1, parallelism);
        _reader = reader;
        Columns = columns;
        _fields = fields;
    }

    /// <inheritdoc />
    public string Path { get; }

    /// <inheritdoc />
    public IReadOnlyList<SampleColumn> Columns { get; }

    /// <inheritdoc />
    public long? RowCount => _reader.Metadata?.NumRows;

    /// <summary>How many columns of a row group are decoded side by side (each thread with its own reader).</summary>
    public int Parallelism { get; }

    /// <summary>
    /// Opens <paramref name="path"/> and reads its schema; GATE2001/GATE2002 when it cannot. Up to
    /// <paramref name="parallelism"/> columns of a row group are decoded side by side.
    /// </summary>
    public static ParquetSampleReader Open(string path, int parallelism = 1)
    {
        var stream = SampleInputErrors.OpenRead(path, FileOptions.RandomAccess);
        ParquetReader? reader = null;
        try
        {
            if (ParquetFooterCheck.Problem(stream) is { } problem)
            {
                stream.Dispose();
                throw SampleInputErrors.Unreadable(path, problem);
            }
            reader = ParquetReader.CreateAsync(stream, leaveStreamOpen: false).GetAwaiter().GetResult();
            var (columns, fields) = DescribeSchema(path, reader.Schema);
            if (reader.Metadata is { } metadata && ParquetChunkLayout.Problem(stream, metadata) is { } damage)
                throw SampleInputErrors.Unreadable(path, damage);
            return new ParquetSampleReader(path, reader, columns, fields, parallelism);
        }
        catch (GateInputException)
        {
            reader?.DisposeAsync().AsTask().GetAwaiter().GetResult();
            stream.Dispose();
            throw;
        }
        catch (Exception ex) when (SampleInputErrors.IsReadFailure(ex))
        {
            reader?.DisposeAsync().AsTask().GetAwaiter().GetResult();
            stream.Dispose();
            throw SampleInputErrors.Unreadable(path, "not a valid Parquet file (" + SampleInputErrors.Describe(ex) + ")", ex);
        }
    }

    /// <inheritdoc />
    public IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns)
    {
        // Validate before the iterator starts, so a bad name fails at the call, not at the first MoveNext.
        var indices = SampleColumnLookup.IndicesOf(Path, Columns, columns);
        var rowGroupSizes = RowGroupSizes();
        return Batches(indices, rowGroupSizes);
    }

    /// <inheritdoc />
    public void Dispose() => _reader.DisposeAsync().AsTask().GetAwaiter().GetResult();

    private IEnumerable<SampleBatch> Batches(int[] indices, int[] rowGroupSizes)
    {
        var largest = rowGroupSizes.Length == 0 ? 0 : Math.Min(rowGroupSizes.Max(), SliceRows);
        var decoders = indices.Select(i => ParquetColumnDecoder.Create(_fields[i]!, Columns[i].Type)).ToArray();
        var buffers = indices.Select(_ => new double[largest]).ToArray();
        // One reader per decoding thread: a reader shares one stream between its columns, so it cannot be used by
        // two threads at once. The first is the one opened with the schema; the others are opened when needed.
        var readers = new ParquetReader?[Math.Clamp(Parallelism, 1, Math.Max(1, decoders.Length))];
        readers[0] = _reader;
        var plainReaders = readers.Select(_ => new PlainChunkReader()).ToArray(); // one per thread: they hold its byte buffers
        // Read at positions, so every decoding thread can share it.
        using var file = OpenHandle();
        try
        {
            long groupStart = 0; // rows of the file before this row group
            for (var group = 0; group < rowGroupSizes.Length; group++)
            {
                var rows = rowGroupSizes[group];
                if (rows == 0) continue; // an empty row group carries no events; a batch of none would only confuse counts
                DecodeRowGroup(group, rows, decoders, readers, plainReaders, file);
                for (var start = 0; start < rows; start += SliceRows)
                {
                    var count = Math.Min(SliceRows, rows - start);
                    for (var c = 0; c < decoders.Length; c++) decoders[c].Convert(buffers[c].AsSpan(0, count));
                    var (g, first, fileRow) = (group, start, groupStart + start);
                    yield return new SampleBatch(buffers, count)
                    {
                        Locate = (row, column) => Origin(g, first + row, fileRow + row, decoders[column], buffers[column][row]),
                    };
                }
                groupStart += rows;
            }
        }
        finally
        {
            for (var r = 1; r < readers.Length; r++) readers[r]?.DisposeAsync().AsTask().GetAwaiter().GetResult();
        }
    }

    private CellOrigin Origin(int group, int rowInGroup, long fileRow, ParquetColumnDecoder decoder, double value) =>
        new(new SourceLocation(Path),
            $"row {fileRow + 1} (row {rowInGroup + 1} of row group {group + 1})",
            decoder.IsNull(rowInGroup) ? "a null (a missing value)" : InvariantNumber.Short(value));

    // Kept out of the iterator: C# forbids catch blocks around yield.
    private void DecodeRowGroup(int group, int rows, ParquetColumnDecoder[] decoders, ParquetReader?[] readers, PlainChunkReader[] plainReaders, Microsoft.Win32.SafeHandles.SafeFileHandle file)
    {
        // Each column lands in its own decoder's buffers, so decoding them side by side changes nothing but the time;
        // a failure is reported for the first failing column, as a sequential read would.
        var failures = new Exception?[decoders.Length];
        var next = -1;
        void Work(int worker)
        {
            ParquetRowGroupReader? rowGroup = null;
            try
            {
                for (var c = Interlocked.Increment(ref next); c < decoders.Length; c = Interlocked.Increment(ref next))
                {
                    try
                    {
                        rowGroup ??= (readers[worker] ??= OpenAnotherReader()).OpenRowGroupReader(group);
                        decoders[c].Read(rowGroup, rows, file, plainReaders[worker]);
                    }
                    catch (Exception ex)
                    {
                        failures[c] = ex;
                    }
                }
            }
            finally
            {
                rowGroup?.Dispose();
            }
        }
        if (readers.Length == 1 || decoders.Length < 2) Work(0);
        else Parallel.For(0, readers.Length, new ParallelOptions { MaxDegreeOfParallelism = readers.Length }, Work);

        var failed = Array.FindIndex(failures, f => f is not null);
        if (failed < 0) return;
        var failure = failures[failed]!;
        if (failure is GateInputException) System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(failure);
        if (failure is NotSupportedException)
            // A valid file using something this reader cannot decode: say what, not "damaged".
            throw SampleInputErrors.Unreadable(
                Path, $"row group {group + 1} of {_reader.RowGroupCount}: {SampleInputErrors.Describe(failure)}", failure);
        if (SampleInputErrors.IsReadFailure(failure))
            throw SampleInputErrors.Unreadable(
                Path, $"row group {group + 1} of {_reader.RowGroupCount}, column '{decoders[failed].Column}', is damaged ({SampleInputErrors.Describe(failure)})", failure);
        System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(failure);
    }

    private Microsoft.Win32.SafeHandles.SafeFileHandle OpenHandle()
    {
        try
        {
            return File.OpenHandle(Path, FileMode.Open, FileAccess.Read, FileShare.Read, FileOptions.RandomAccess);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or NotSupportedException or ArgumentException)
        {
            throw SampleInputErrors.OpenFailure(Path, ex);
        }
    }

    private ParquetReader OpenAnotherReader()
    {
        var stream = SampleInputErrors.OpenRead(Path, FileOptions.RandomAccess);
        try
        {
            return ParquetReader.CreateAsync(stream, leaveStreamOpen: false).GetAwaiter().GetResult();
        }
        catch
        {
            stream.Dispose();
            throw;
        }
    }

    private int[] RowGroupSizes()
    {
        var sizes = new int[_reader.RowGroupCount];
        for (var g = 0; g < sizes.Length; g++)
        {
            var rows = _reader.Metadata?.RowGroups[g].NumRows ?? -1;
            if (rows < 0 || rows > Array.MaxLength)
                throw SampleInputErrors.Unreadable(
                    Path, $"row group {g + 1} claims {rows} rows, which cannot be read in one piece");
            sizes[g] = (int)rows;
        }
        return sizes;
    }

    private static (IReadOnlyList<SampleColumn>, DataField?[]) DescribeSchema(string path, ParquetSchema schema)
    {
        var columns = new List<SampleColumn>(schema.Fields.Count);
        var fields = new DataField?[schema.Fields.Count];
        var seen = new Dictionary<string, int>(StringComparer.Ordinal);
        for (var i = 0; i < schema.Fields.Count; i++)
        {
            var field = schema.Fields[i];
            // Arrow-based writers accept two columns of one name; which of them a name would read is then arbitrary
            // (the library maps a name to the last), so the file is refused, as a CSV header naming a column twice is.
            if (!seen.TryAdd(field.Name, i))
                throw new GateInputException(ErrorCodes.SampleUnreadable,
                    $"sample file '{path}': column '{field.Name}' appears twice in the Parquet schema (columns {seen[field.Name] + 1} and {i + 1} of {schema.Fields.Count}); "
                    + "column names must be unique, or which column a feature reads is arbitrary: rename one when writing the file",
                    new SourceLocation(path));
            var type = field is DataField data && !data.IsArray && data.MaxRepetitionLevel == 0
                ? TypeOf(data.ClrType)
                : SampleValueType.Unsupported; // structs, lists and maps
            fields[i] = type == SampleValueType.Unsupported ? null : (DataField)field;
            columns.Add(new SampleColumn(field.Name, type, field.IsNullable));
        }
        return (columns, fields);
    }

    private static SampleValueType TypeOf(Type clrType) =>
        clrType == typeof(float) ? SampleValueType.Float32
        : clrType == typeof(double) ? SampleValueType.Float64
        : clrType == typeof(sbyte) ? SampleValueType.Int8
        : clrType == typeof(short) ? SampleValueType.Int16
        : clrType == typeof(int) ? SampleValueType.Int32
        : clrType == typeof(long) ? SampleValueType.Int64
        : clrType == typeof(byte) ? SampleValueType.UInt8
        : clrType == typeof(ushort) ? SampleValueType.UInt16
        : clrType == typeof(uint) ? SampleValueType.UInt32
        : clrType == typeof(ulong) ? SampleValueType.UInt64
        : clrType == typeof(bool) ? SampleValueType.Boolean
        : SampleValueType.Unsupported; // strings, bytes, decimals, dates, times, half floats
}
