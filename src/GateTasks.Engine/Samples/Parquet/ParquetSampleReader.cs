using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using Microsoft.Win32.SafeHandles;
using Parquet;
using Parquet.Meta;
using Parquet.Schema;

namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// A Parquet sample file, opened once: its footer is checked and parsed (by Parquet.Net) and its schema described
/// when it is opened, and that metadata is kept and used for every read, so a file is not parsed again however many
/// passes read it. No file handle is held between reads: each read opens the file, makes sure it still ends in the
/// footer read at opening (<see cref="ParquetFooterStamp"/>), and reads it a row group at a time, handed out in
/// batches of at most <see cref="SliceRows"/> rows, column chunk by column chunk (which reader takes a chunk is
/// decided in <see cref="ParquetColumnDecoder"/>).
/// </summary>
/// <remarks>
/// Parquet.Net is asynchronous; its calls are awaited synchronously, which is safe for the console and MSBuild
/// hosts (no synchronisation context to deadlock on).
/// </remarks>
internal sealed class ParquetSampleReader : ISampleReader
{
    /// <summary>
    /// Rows per batch: a row group is decoded whole in its stored types, then handed on in slices of this many rows
    /// (converted to doubles where read as doubles), so the double buffers stay at a few megabytes however large the
    /// row groups are.
    /// </summary>
    internal const int SliceRows = 1 << 16;

    private readonly FileMetaData _metadata;
    private readonly DataField?[] _fields;
    private readonly ParquetFooterStamp _footer;

    private ParquetSampleReader(string path, FileMetaData metadata, IReadOnlyList<SampleColumn> columns, DataField?[] fields,
        ParquetFooterStamp footer)
    {
        Path = path;
        _metadata = metadata;
        Columns = columns;
        _fields = fields;
        _footer = footer;
    }

    /// <inheritdoc />
    public string Path { get; }

    /// <inheritdoc />
    public IReadOnlyList<SampleColumn> Columns { get; }

    /// <inheritdoc />
    public long? RowCount => _metadata.NumRows;

    /// <inheritdoc />
    public long MetadataBytes => _footer.FooterLength;

    private int RowGroupCount => _metadata.RowGroups?.Count ?? 0;

    /// <summary>
    /// Opens <paramref name="path"/>, checks its frame, footer and chunk layout, and reads its schema; GATE2001/GATE2002
    /// when it cannot. The file is closed again before this returns.
    /// </summary>
    public static ParquetSampleReader Open(string path)
    {
        var stream = SampleInputErrors.OpenRead(path, FileOptions.RandomAccess);
        ParquetReader? reader = null;
        try
        {
            if (ParquetFooterCheck.Problem(stream) is { } problem)
                throw SampleInputErrors.Unreadable(path, problem);
            var footer = ParquetFooterStamp.Read(stream.SafeFileHandle);
            // Read in place: Parquet.Net's asynchronous reads would each hop to the thread pool (SynchronousReadStream).
            reader = ParquetReader.CreateAsync(new SynchronousReadStream(stream, leaveOpen: true), leaveStreamOpen: true).GetAwaiter().GetResult();
            var (columns, fields) = DescribeSchema(path, reader.Schema);
            var metadata = reader.Metadata ?? throw new InvalidDataException("the footer holds no file metadata");
            if (ParquetChunkLayout.Problem(stream, metadata) is { } damage)
                throw SampleInputErrors.Unreadable(path, damage);
            return new ParquetSampleReader(path, metadata, columns, fields, footer);
        }
        catch (Exception ex) when (SampleInputErrors.IsReadFailure(ex))
        {
            throw SampleInputErrors.Unreadable(path, "not a valid Parquet file (" + SampleInputErrors.Describe(ex) + ")", ex);
        }
        finally
        {
            reader?.DisposeAsync().AsTask().GetAwaiter().GetResult();
            stream.Dispose();
        }
    }

    /// <inheritdoc />
    public IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns, int parallelism = 1) =>
        ReadBatches(columns, parallelism, null);

    /// <inheritdoc />
    public IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns, int parallelism, DecodedFloat32Slice? onDecoded,
        IReadOnlyList<bool>? unreadOnceTaken = null)
    {
        // Validate before the iterator starts, so a bad name fails at the call, not at the first MoveNext.
        var indices = SampleColumnLookup.IndicesOf(Path, Columns, columns);
        var rowGroupSizes = RowGroupSizes();
        var lendable = indices.Select((_, c) => onDecoded is not null && unreadOnceTaken is { } u && c < u.Count && u[c]).ToArray();
        return Batches(indices, rowGroupSizes, Math.Max(1, parallelism), onDecoded, lendable);
    }

    /// <inheritdoc />
    public void Dispose()
    {
        // Each read opens its own file handle and closes it when enumeration ends; nothing is held between reads.
    }

    private IEnumerable<SampleBatch> Batches(int[] indices, int[] rowGroupSizes, int parallelism, DecodedFloat32Slice? onDecoded, bool[] lendable)
    {
        var largest = rowGroupSizes.Length == 0 ? 0 : Math.Min(rowGroupSizes.Max(), SliceRows);
        var decoders = indices.Select(i => ParquetColumnDecoder.Create(_fields[i]!, Columns[i].Type)).ToArray();
        var buffers = indices.Select(_ => new double[largest]).ToArray();
        var threads = Math.Clamp(parallelism, 1, Math.Max(1, decoders.Length));
        // Parquet.Net's readers, one per decoding thread (a reader shares one stream between its columns, so it cannot
        // be used by two threads at once), are opened only for a chunk the plain-chunk reader does not take.
        var libraryReaders = new ParquetReader?[threads];
        var plainReaders = libraryReaders.Select(_ => new PlainChunkReader()).ToArray(); // one per thread: they hold its byte buffers
        // Per thread: the values buffer of the last column it decoded whose every slice was taken (and is never read
        // again), handed to the next such column it decodes. A row group of 20 float32 columns is then decoded into
        // one buffer per thread instead of 20: memory touched once per buffer (a page fault per page, which is dear
        // in a virtual machine) and still in the core's cache when reused.
        var spares = new Array?[threads];
        // Read at positions, so every decoding thread can share it.
        using var file = OpenUnchanged();
        try
        {
            long groupStart = 0; // rows of the file before this row group
            for (var group = 0; group < rowGroupSizes.Length; group++)
            {
                var rows = rowGroupSizes[group];
                if (rows == 0) continue; // an empty row group carries no events; a batch of none would only confuse counts
                // Per slice and column: taken as decoded (only float32 columns without nulls are offered).
                var taken = new bool[(rows + SliceRows - 1) / SliceRows][];
                for (var s = 0; s < taken.Length; s++) taken[s] = new bool[decoders.Length];
                DecodeRowGroup(group, rows, decoders, libraryReaders, plainReaders, file, onDecoded, taken, lendable, spares);
                var startValues = new int[decoders.Length]; // per column: the values (non-null rows) before the slice
                for (var start = 0; start < rows; start += SliceRows)
                {
                    var count = Math.Min(SliceRows, rows - start);
                    // Columns are converted to doubles when first read, on the thread that reads them (or never, for
                    // a float32 column read as floats): the slice only says where its rows start.
                    var slice = new Slice(decoders, start, count, (int[])startValues.Clone(), taken[start / SliceRows]);
                    var (g, first, fileRow) = (group, start, groupStart + start);
                    yield return new SampleBatch(buffers, count, slice)
                    {
                        Locate = (row, column) => Origin(g, first + row, fileRow + row, decoders[column]),
                    };
                    for (var c = 0; c < decoders.Length; c++) startValues[c] += decoders[c].Present(start, count);
                }
                groupStart += rows;
            }
        }
        finally
        {
            foreach (var reader in libraryReaders) reader?.DisposeAsync().AsTask().GetAwaiter().GetResult();
        }
    }

    private CellOrigin Origin(int group, int rowInGroup, long fileRow, ParquetColumnDecoder decoder) =>
        new(new SourceLocation(Path),
            $"row {fileRow + 1} (row {rowInGroup + 1} of row group {group + 1})",
            decoder.IsNull(rowInGroup) ? "a null (a missing value)" : InvariantNumber.Short(decoder.ValueAt(rowInGroup)));

    /// <summary>One slice of the row group last decoded: its columns, converted when asked for.</summary>
    private sealed class Slice(ParquetColumnDecoder[] decoders, int startRow, int rows, int[] startValues, bool[] taken) : IStoredBatchColumns
    {
        public void Convert(int column, Span<double> destination) =>
            decoders[column].Convert(startRow, startValues[column], destination[..rows]);

        public ReadOnlySpan<float> Float32(int column) => decoders[column].Float32(startRow, rows);

        public bool TakenOnDecoding(int column) => taken[column];
    }

    // Kept out of the iterator: C# forbids catch blocks around yield.
    private void DecodeRowGroup(int group, int rows, ParquetColumnDecoder[] decoders, ParquetReader?[] libraryReaders, PlainChunkReader[] plainReaders, SafeFileHandle file,
        DecodedFloat32Slice? onDecoded, bool[][] taken, bool[] lendable, Array?[] spares)
    {
        // Each column lands in its own decoder's buffers, so decoding them side by side changes nothing but the time;
        // a failure is reported for the first failing column, as a sequential read would. A decoded float32 column is
        // offered slice by slice on the same thread at once, while it is still in cache.
        var failures = new Exception?[decoders.Length];
        var offerFailures = new Exception?[decoders.Length];
        var next = -1;
        var rowGroup = _metadata.RowGroups![group];
        void Work(int worker)
        {
            ParquetRowGroupReader? library = null;
            ParquetRowGroupReader Library() => library ??= (libraryReaders[worker] ??= OpenLibraryReader()).OpenRowGroupReader(group);
            try
            {
                for (var c = Interlocked.Increment(ref next); c < decoders.Length; c = Interlocked.Increment(ref next))
                {
                    try
                    {
                        if (lendable[c] && decoders[c].Adopt(spares[worker])) spares[worker] = null;
                        decoders[c].Read(rowGroup, rows, file, plainReaders[worker], Library);
                    }
                    catch (Exception ex)
                    {
                        failures[c] = ex;
                        continue;
                    }
                    if (onDecoded is null) continue;
                    try
                    {
                        for (var s = 0; s < taken.Length; s++)
                        {
                            var start = s * SliceRows;
                            var values = decoders[c].Float32(start, Math.Min(SliceRows, rows - start));
                            if (values.IsEmpty) break; // not float32, or with nulls: read through the batch
                            taken[s][c] = onDecoded(c, values);
                        }
                        // Every slice taken: the values are not read again, and their buffer serves the thread's next column.
                        if (lendable[c] && taken.All(slice => slice[c]) && spares[worker] is null) spares[worker] = decoders[c].Release();
                    }
                    catch (Exception ex)
                    {
                        offerFailures[c] = ex;
                    }
                }
            }
            finally
            {
                library?.Dispose();
            }
        }
        if (libraryReaders.Length == 1 || decoders.Length < 2) Work(0);
        else Parallel.For(0, libraryReaders.Length, new ParallelOptions { MaxDegreeOfParallelism = libraryReaders.Length }, Work);

        var failed = Array.FindIndex(failures, f => f is not null);
        if (failed < 0)
        {
            // Not the file's fault: what the values were handed to failed, and says so itself.
            if (Array.Find(offerFailures, f => f is not null) is { } offerFailure)
                System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(offerFailure);
            return;
        }
        var failure = failures[failed]!;
        if (failure is GateInputException) System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(failure);
        if (failure is NotSupportedException)
            // A valid file using something this reader cannot decode: say what, not "damaged".
            throw SampleInputErrors.Unreadable(
                Path, $"row group {group + 1} of {RowGroupCount}: {SampleInputErrors.Describe(failure)}", failure);
        if (SampleInputErrors.IsReadFailure(failure))
            throw SampleInputErrors.Unreadable(
                Path, $"row group {group + 1} of {RowGroupCount}, column '{decoders[failed].Column}', is damaged ({SampleInputErrors.Describe(failure)})", failure);
        System.Runtime.ExceptionServices.ExceptionDispatchInfo.Throw(failure);
    }

    // Opens the file for reading at positions; the metadata kept from opening fits it only if its footer is unchanged.
    private SafeFileHandle OpenUnchanged()
    {
        SafeFileHandle file;
        try
        {
            file = File.OpenHandle(Path, FileMode.Open, FileAccess.Read, FileShare.Read, FileOptions.RandomAccess);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or NotSupportedException or ArgumentException)
        {
            throw SampleInputErrors.OpenFailure(Path, ex);
        }
        try
        {
            if (ParquetFooterStamp.Read(file) == _footer) return file;
        }
        catch (IOException ex)
        {
            file.Dispose();
            throw SampleInputErrors.Unreadable(Path, SampleInputErrors.Describe(ex), ex);
        }
        file.Dispose();
        throw SampleInputErrors.Unreadable(Path,
            "it changed after the sample was opened (it no longer ends in the footer read then); a sample must not change while it is read");
    }

    // Parquet.Net parses the footer again for its own reader (it cannot be handed the metadata already parsed): only
    // for a file with a chunk the plain-chunk reader does not take, and only after the footer was found unchanged.
    private ParquetReader OpenLibraryReader()
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
        var sizes = new int[RowGroupCount];
        for (var g = 0; g < sizes.Length; g++)
        {
            var rows = _metadata.RowGroups![g].NumRows;
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

    private static SampleValueType TypeOf(System.Type clrType) =>
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
