using System.Text.RegularExpressions;
using GateTasks.Engine.Diagnostics;
using PureHDF;
using PureHDF.Selections;

namespace GateTasks.Engine.Samples.Hdf5;

/// <summary>
/// An HDF5 sample file (read with PureHDF, a pure .NET implementation of the format), in either of two layouts:
/// a table, a 1-D dataset of a compound type whose members are the columns; or one 1-D dataset per column, named
/// after it. Columns are taken from the root group, or, when the root holds no dataset but a single group, from
/// that group (and so on down). The layout is read once when the file is opened; each read opens the file, checks it
/// is unchanged (<see cref="FileStamp"/>) and reads hyperslabs of <see cref="BatchRows"/> rows, so memory is bounded
/// by the batch (and PureHDF's chunk cache), whatever the datasets' sizes. Contiguous and chunked datasets are read,
/// with the filters PureHDF decodes itself (deflate/gzip, shuffle, Fletcher-32, scale-offset); a dataset under any
/// other filter (LZF, Blosc, SZIP …) is refused, naming the dataset and the filter (GATE2018).
/// </summary>
internal sealed partial class Hdf5SampleReader : ISampleReader
{
    /// <summary>Rows per batch at most, as for the other formats.</summary>
    public const int BatchRows = 1 << 16;

    /// <summary>Where one column is read from: a dataset of its own, or a member of a compound dataset (its byte offset in a record).</summary>
    private sealed record Source(string Dataset, long Length, bool Compound, int RecordSize, int Offset, PackedNumber? Number);

    private readonly Source[] _sources;
    private readonly FileStamp _stamp;
    private readonly int _batchRows;

    private Hdf5SampleReader(string path, IReadOnlyList<SampleColumn> columns, Source[] sources, FileStamp stamp, int batchRows)
    {
        Path = path;
        Columns = columns;
        _sources = sources;
        _stamp = stamp;
        _batchRows = batchRows;
        var lengths = sources.Where((s, i) => columns[i].Refusal is null).Select(s => s.Length).Distinct().ToArray();
        RowCount = lengths.Length == 1 ? lengths[0] : null;
    }

    /// <inheritdoc />
    public string Path { get; }

    /// <inheritdoc />
    public long? RowCount { get; }

    /// <inheritdoc />
    public IReadOnlyList<SampleColumn> Columns { get; }

    /// <inheritdoc />
    public long MetadataBytes => 0; // column names and dataset paths only

    /// <summary>Opens <paramref name="path"/> and finds its columns (GATE2002, GATE2013, GATE2017, GATE2019 when it cannot).</summary>
    /// <param name="path">The HDF5 file.</param>
    /// <param name="batchRows">Rows per batch at most.</param>
    public static Hdf5SampleReader Open(string path, int batchRows = BatchRows)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(batchRows, 1);
        var stamp = FileStamp.Of(path);
        using var stream = SampleInputErrors.OpenRead(path, FileOptions.RandomAccess);
        RequireWhole(path, stream);
        try
        {
            using var file = H5File.Open(stream, leaveOpen: true);
            var (groupPath, group) = ColumnGroup(file);
            var columns = new List<SampleColumn>();
            var sources = new List<Source>();
            foreach (var dataset in group.Children().OfType<IH5Dataset>().OrderBy(d => d.Name, StringComparer.Ordinal))
                Describe(path, groupPath, dataset, columns, sources);
            if (columns.Count == 0)
                throw new GateInputException(ErrorCodes.SampleNoColumns,
                    $"sample file '{path}' holds no dataset in its group '{groupPath}' that can be read as columns: "
                    + "write a 1-D compound dataset (a table) or one 1-D dataset per column",
                    new SourceLocation(path));
            var seen = new HashSet<string>(StringComparer.Ordinal);
            for (var i = 0; i < columns.Count; i++)
                if (!seen.Add(columns[i].Name))
                    throw new GateInputException(ErrorCodes.SampleUnreadable,
                        $"sample file '{path}': column '{columns[i].Name}' appears twice in group '{groupPath}' (a dataset and a member of a table, or members of two tables); "
                        + "column names must be unique, or which column a feature reads is arbitrary",
                        new SourceLocation(path));
            return new Hdf5SampleReader(path, columns, sources.ToArray(), stamp, batchRows);
        }
        catch (Exception ex) when (SampleInputErrors.IsReadFailure(ex))
        {
            throw SampleInputErrors.Unreadable(path, "not a readable HDF5 file (" + SampleInputErrors.Describe(ex) + ")", ex);
        }
    }

    /// <inheritdoc />
    public IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns, int parallelism = 1)
    {
        var indices = SampleColumnLookup.IndicesOf(Path, Columns, columns);
        var first = _sources[indices[0]];
        foreach (var i in indices)
            if (_sources[i].Length != first.Length)
                throw new GateInputException(ErrorCodes.SampleColumnLengths,
                    $"sample file '{Path}': dataset '{first.Dataset}' holds {first.Length} rows but dataset '{_sources[i].Dataset}' holds {_sources[i].Length}; "
                    + "the columns of a sample must have one length (one value per event)",
                    new SourceLocation(Path));
        // A wide compound record makes batches of fewer rows: a block read is at most BlockBytes.
        var widest = indices.Max(i => _sources[i].RecordSize);
        var rows = (int)Math.Clamp(PackedNumber.BlockBytes / Math.Max(1, widest), 1, _batchRows);
        return Batches(indices, first.Length, rows);
    }

    /// <inheritdoc />
    public void Dispose()
    {
        // Each read opens its own file handle and closes it when enumeration ends; nothing is held between reads.
    }

    private IEnumerable<SampleBatch> Batches(int[] indices, long total, int batchRows)
    {
        _stamp.RequireUnchanged(Path);
        var buffers = indices.Select(_ => new double[(int)Math.Min(batchRows, Math.Max(1, total))]).ToArray();
        var datasets = indices.Select(i => _sources[i].Dataset).Distinct(StringComparer.Ordinal).ToArray();
        using var stream = SampleInputErrors.OpenRead(Path, FileOptions.RandomAccess);
        using var file = Guard(null, () => H5File.Open(stream, leaveOpen: true));
        var handles = datasets.ToDictionary(d => d, d => Guard(d, () => file.Dataset(d)), StringComparer.Ordinal);
        for (long start = 0; start < total; start += batchRows)
        {
            var rows = (int)Math.Min(batchRows, total - start);
            var selection = new HyperslabSelection((ulong)start, (ulong)rows);
            foreach (var dataset in datasets)
            {
                var columnsHere = Enumerable.Range(0, indices.Length).Where(c => _sources[indices[c]].Dataset == dataset).ToArray();
                var handle = handles[dataset];
                if (_sources[indices[columnsHere[0]]].Compound)
                {
                    var records = Guard(dataset, () => handle.Read<byte[]>(selection));
                    foreach (var c in columnsHere)
                    {
                        var s = _sources[indices[c]];
                        if (records.Length < (long)rows * s.RecordSize)
                            throw SampleInputErrors.Unreadable(Path, $"dataset '{dataset}' gave fewer bytes than {rows} records need");
                        s.Number!.Value.Decode(records, s.RecordSize, s.Offset, buffers[c].AsSpan(0, rows));
                    }
                }
                else
                {
                    var number = _sources[indices[columnsHere[0]]].Number!.Value;
                    foreach (var c in columnsHere) ReadValues(dataset, handle, number, selection, buffers[c].AsSpan(0, rows));
                }
            }
            var from = start;
            yield return new SampleBatch(buffers, rows)
            {
                Locate = (row, column) => new CellOrigin(new SourceLocation(Path),
                    $"row {from + row + 1} (index {from + row}) of dataset '{_sources[indices[column]].Dataset}'",
                    InvariantNumber.Short(buffers[column][row])),
            };
        }
    }

    // A dataset of its own, read in its stored type (little-endian: big-endian ones were refused at opening).
    private void ReadValues(string dataset, IH5Dataset handle, PackedNumber number, Selection selection, Span<double> into)
    {
        try
        {
            ReadInto(handle, number.Type, selection, into);
        }
        catch (Exception ex) when (SampleInputErrors.IsReadFailure(ex))
        {
            throw ReadFailure(Path, dataset, ex);
        }
    }

    private static void ReadInto(IH5Dataset handle, SampleValueType type, Selection selection, Span<double> into)
    {
        switch (type)
        {
            case SampleValueType.Float64: Copy(handle.Read<double[]>(selection), into, v => v); break;
            case SampleValueType.Float32: Copy(handle.Read<float[]>(selection), into, v => v); break;
            case SampleValueType.Int8: Copy(handle.Read<sbyte[]>(selection), into, v => v); break;
            case SampleValueType.UInt8: Copy(handle.Read<byte[]>(selection), into, v => v); break;
            case SampleValueType.Boolean: Copy(handle.Read<byte[]>(selection), into, v => v != 0 ? 1 : 0); break;
            case SampleValueType.Int16: Copy(handle.Read<short[]>(selection), into, v => v); break;
            case SampleValueType.UInt16: Copy(handle.Read<ushort[]>(selection), into, v => v); break;
            case SampleValueType.Int32: Copy(handle.Read<int[]>(selection), into, v => v); break;
            case SampleValueType.UInt32: Copy(handle.Read<uint[]>(selection), into, v => v); break;
            case SampleValueType.Int64: Copy(handle.Read<long[]>(selection), into, v => v); break;
            case SampleValueType.UInt64: Copy(handle.Read<ulong[]>(selection), into, v => v); break;
            default: throw new InvalidOperationException($"{type} is not read from HDF5");
        }
    }

    private static void Copy<T>(T[] values, Span<double> into, Func<T, double> convert)
    {
        if (values.Length < into.Length) throw new InvalidDataException($"{values.Length} values read where {into.Length} were asked for");
        for (var r = 0; r < into.Length; r++) into[r] = convert(values[r]);
    }

    // Every failure of the library while reading is the file's (or a filter it cannot decode): a coded message naming the dataset.
    private T Guard<T>(string? dataset, Func<T> read)
    {
        try
        {
            return read();
        }
        catch (Exception ex) when (SampleInputErrors.IsReadFailure(ex))
        {
            throw ReadFailure(Path, dataset, ex);
        }
    }

    [GeneratedRegex(@"filter '([^']*)' with ID '(\d+)'", RegexOptions.CultureInvariant)]
    private static partial Regex MissingFilter();

    private static GateInputException ReadFailure(string path, string? dataset, Exception ex)
    {
        var (code, text) = Failure(dataset, ex);
        return new GateInputException(code, $"sample file '{path}': {text}", new SourceLocation(path), ex);
    }

    // What went wrong, without the file's name: a filter the reader lacks (GATE2018) or anything else (GATE2002).
    private static (string Code, string Text) Failure(string? dataset, Exception ex)
    {
        var where = dataset is null ? "the file" : $"dataset '{dataset}'";
        if (MissingFilter().Match(ex.Message) is { Success: true } filter)
            return (ErrorCodes.SampleHdf5Filter,
                $"{where} is compressed with the HDF5 filter '{filter.Groups[1].Value}' (id {filter.Groups[2].Value}), which GateTasks cannot decode; "
                + "it reads uncompressed datasets and the filters deflate (gzip), shuffle, Fletcher-32 and scale-offset: rewrite it with compression='gzip'");
        return (ErrorCodes.SampleUnreadable, $"{where} cannot be read ({SampleInputErrors.Describe(ex)})");
    }

    // GATE2017 without the signature, GATE2013 when the file is shorter than its superblock says.
    private static void RequireWhole(string path, FileStream stream)
    {
        long? offset, recorded;
        try
        {
            (offset, recorded) = Hdf5Superblock.Read(stream);
        }
        catch (IOException ex)
        {
            throw SampleInputErrors.Unreadable(path, SampleInputErrors.Describe(ex), ex);
        }
        if (offset is null)
            throw new GateInputException(ErrorCodes.SampleContentMismatch,
                $"sample file '{path}' is named as an HDF5 file but holds no HDF5 signature (\\x89HDF\\r\\n\\x1a\\n at byte 0, 512, 1024 …)",
                new SourceLocation(path));
        if (recorded is { } length && stream.Length < length)
            throw new GateInputException(ErrorCodes.SampleArraySize,
                $"sample file '{path}' is {stream.Length} bytes long, but its HDF5 superblock records {length}: it is truncated",
                new SourceLocation(path));
    }

    // The root, or the single group the root holds when it holds no dataset (and so on down).
    private static (string Path, IH5Group Group) ColumnGroup(IH5Group file)
    {
        IH5Group group = file;
        var path = "/";
        for (var depth = 0; depth < 16; depth++)
        {
            var children = group.Children().ToList();
            if (children.Any(c => c is IH5Dataset) || children.Count != 1 || children[0] is not IH5Group only) break;
            group = only;
            path = path.TrimEnd('/') + "/" + only.Name;
        }
        return (path, group);
    }

    private static void Describe(string path, string groupPath, IH5Dataset dataset, List<SampleColumn> columns, List<Source> sources)
    {
        var name = dataset.Name;
        var full = groupPath.TrimEnd('/') + "/" + name;
        var dims = dataset.Space.Dimensions;
        var type = dataset.Type;
        var stored = Hdf5StoredType.Of(type);
        var table = type.Class == H5DataTypeClass.Compound && stored.Kind.StartsWith("a compound", StringComparison.Ordinal);
        var what = $"dataset '{full}'";
        var shape = $"({string.Join(", ", dims)}{(dims.Length == 1 ? "," : "")})";
        ColumnRefusal? refusal = null;
        if (dims.Length != 1)
            refusal = new ColumnRefusal(ErrorCodes.SampleArrayShape,
                $"{what} has shape {shape}; a column is a 1-D dataset (one value per event) or a member of a 1-D compound dataset");
        else if (Probe(full, dataset, table, stored.Number) is { } failure)
            refusal = new ColumnRefusal(failure.Code, failure.Text);
        var length = dims.Length == 1 ? (long)dims[0] : 0;

        if (table)
        {
            foreach (var member in type.Compound.Members)
            {
                var memberType = Hdf5StoredType.Of(member.Type);
                var memberRefusal = refusal ?? (memberType.Number is null
                    ? new ColumnRefusal(ErrorCodes.SampleColumnType, $"member '{member.Name}' of {what} is {memberType.Kind}; GateTasks reads booleans, signed and unsigned integers of 8 to 64 bits, float32 and float64")
                    : null);
                columns.Add(new SampleColumn(member.Name, memberRefusal is null ? memberType.Number!.Value.Type : SampleValueType.Unsupported, false, memberRefusal));
                sources.Add(new Source(full, length, true, type.Size, member.Offset, memberType.Number));
            }
            return;
        }
        if (refusal is null && stored.Number is null)
            refusal = new ColumnRefusal(ErrorCodes.SampleColumnType,
                $"{what} holds {stored.Kind}; GateTasks reads booleans, signed and unsigned integers of 8 to 64 bits, float32 and float64");
        if (refusal is null && stored.Number is { BigEndian: true } big)
            refusal = new ColumnRefusal(ErrorCodes.SampleColumnType,
                $"{what} holds {big} values, which the HDF5 reader (PureHDF 2.2) does not convert in a dataset of its own; "
                + "write it little-endian (h5py's default), or make it a member of a compound table, whose members are read in either byte order");
        columns.Add(new SampleColumn(name, refusal is null ? stored.Number!.Value.Type : SampleValueType.Unsupported, false, refusal));
        sources.Add(new Source(full, length, false, type.Size, 0, stored.Number));
    }

    // Reads a dataset's first element, so that a filter the reader lacks is found when the file is opened, not in the middle of a pass.
    private static (string Code, string Text)? Probe(string full, IH5Dataset dataset, bool table, PackedNumber? number)
    {
        if (dataset.Space.Dimensions is not [> 0]) return null;
        try
        {
            var one = new HyperslabSelection(0, 1);
            if (table) _ = dataset.Read<byte[]>(one);
            else if (number is { BigEndian: false } n) ReadInto(dataset, n.Type, one, new double[1]);
            return null;
        }
        catch (Exception ex) when (SampleInputErrors.IsReadFailure(ex))
        {
            return Failure(full, ex);
        }
    }
}
