using Parquet;
using Parquet.Schema;

namespace GateTasks.Engine.Samples;

/// <summary>
/// Reads a Parquet sample file with Parquet.Net, one row group per batch. Only the footer is read on opening;
/// data is read column chunk by column chunk as batches are requested.
/// </summary>
/// <remarks>
/// Parquet.Net is asynchronous; its calls are awaited synchronously, which is safe for the console and MSBuild
/// hosts (no synchronisation context to deadlock on).
/// </remarks>
internal sealed class ParquetSampleReader : ISampleReader
{
    private readonly ParquetReader _reader;
    private readonly DataField?[] _fields;

    private ParquetSampleReader(string path, ParquetReader reader, IReadOnlyList<SampleColumn> columns, DataField?[] fields)
    {
        Path = path;
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

    /// <summary>Opens <paramref name="path"/> and reads its schema; GATE2001/GATE2002 when it cannot.</summary>
    public static ParquetSampleReader Open(string path)
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
            var (columns, fields) = DescribeSchema(reader.Schema);
            return new ParquetSampleReader(path, reader, columns, fields);
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
        var largest = rowGroupSizes.Length == 0 ? 0 : rowGroupSizes.Max();
        var decoders = indices.Select(i => ParquetColumnDecoder.Create(_fields[i]!, Columns[i].Type)).ToArray();
        var buffers = indices.Select(_ => new double[largest]).ToArray();

        for (var group = 0; group < rowGroupSizes.Length; group++)
        {
            var rows = rowGroupSizes[group];
            if (rows == 0) continue; // an empty row group carries no events; a batch of none would only confuse counts
            DecodeRowGroup(group, rows, decoders, buffers);
            yield return new SampleBatch(buffers, rows);
        }
    }

    // Kept out of the iterator: C# forbids catch blocks around yield.
    private void DecodeRowGroup(int group, int rows, ParquetColumnDecoder[] decoders, double[][] buffers)
    {
        try
        {
            var rowGroup = _reader.OpenRowGroupReader(group);
            for (var c = 0; c < decoders.Length; c++)
                decoders[c].Decode(rowGroup, rows, buffers[c]);
        }
        catch (NotSupportedException ex)
        {
            // A valid file using something this reader cannot decode: say what, not "damaged".
            throw SampleInputErrors.Unreadable(
                Path, $"row group {group + 1} of {_reader.RowGroupCount}: {SampleInputErrors.Describe(ex)}", ex);
        }
        catch (Exception ex) when (SampleInputErrors.IsReadFailure(ex))
        {
            throw SampleInputErrors.Unreadable(
                Path, $"row group {group + 1} of {_reader.RowGroupCount} is damaged ({SampleInputErrors.Describe(ex)})", ex);
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

    private static (IReadOnlyList<SampleColumn>, DataField?[]) DescribeSchema(ParquetSchema schema)
    {
        var columns = new List<SampleColumn>(schema.Fields.Count);
        var fields = new DataField?[schema.Fields.Count];
        for (var i = 0; i < schema.Fields.Count; i++)
        {
            var field = schema.Fields[i];
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
