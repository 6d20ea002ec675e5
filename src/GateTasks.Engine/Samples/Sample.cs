using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>
/// A sample made of one or more files, read as one stream of batches in file order. Opening reads and checks each
/// file's schema (a Parquet footer, a CSV header) once, and what it read is used again by every pass; files are
/// opened one at a time while reading, so no file handles are held between reads.
/// </summary>
/// <remarks>
/// What opening read is kept for files whose stored metadata adds up to at most <see cref="KeptMetadataBytes"/>;
/// a later file keeps only its column names and is opened (its footer parsed) again when read, so memory does not
/// grow with the sample however many files or row groups it has.
/// </remarks>
internal sealed class Sample
{
    /// <summary>
    /// The stored footer bytes a sample keeps parsed between opening and reading: a file of 20 columns in one row group
    /// has a footer of a few kilobytes, so thousands of such files are opened once.
    /// </summary>
    internal const long KeptMetadataBytes = 16L << 20;

    private readonly IReadOnlyList<SampleColumn>[] _fileColumns;

    // The readers made when the sample was opened, one per file (null where one was not kept).
    private readonly ISampleReader?[] _readers;

    private readonly Lazy<IReadOnlyList<ShardFile>> _shards;

    private Sample(IReadOnlyList<string> files, IReadOnlyList<SampleColumn>[] fileColumns, ISampleReader?[] readers, long? totalRows)
    {
        Files = files;
        _shards = new Lazy<IReadOnlyList<ShardFile>>(() => ShardContent.Identify(files));
        TotalRows = totalRows;
        _fileColumns = fileColumns;
        _readers = readers;
        Columns = CommonColumns(fileColumns);
    }

    /// <summary>The files, in reading order.</summary>
    public IReadOnlyList<string> Files { get; }

    /// <summary>
    /// The files with the digests of their content, in reading order (no two alike). Digested when the sample is opened
    /// if it has several files (a copy must be refused before any is read), else when first asked for (a partial file
    /// records it; a check of one file has no copy to find and skips the extra pass).
    /// </summary>
    public IReadOnlyList<ShardFile> Shards => _shards.Value;

    /// <summary>The columns every file has, in the first file's order, with the first file's type.</summary>
    public IReadOnlyList<SampleColumn> Columns { get; }

    /// <summary>
    /// The names of the columns any file has, in first-seen order. A contract is matched against these, so a column
    /// that only some files lack is reported at such a file when it is read (GATE2004), not as unknown to the sample.
    /// </summary>
    public IReadOnlyList<string> ColumnNamesInAnyFile => _fileColumns.SelectMany(f => f).Select(c => c.Name).Distinct(StringComparer.Ordinal).ToList();

    /// <summary>Rows in all files, when every file states its count.</summary>
    public long? TotalRows { get; }

    /// <summary>Rows read by the last (or current) <see cref="ReadBatches"/> enumeration.</summary>
    public long RowsRead { get; private set; }

    /// <summary>The file the current batch comes from, while <see cref="ReadBatches"/> is being enumerated.</summary>
    public string? CurrentFile { get; private set; }

    /// <summary>
    /// The index within its file of the first row of the batch last read (0-based): with the row's place in the batch,
    /// a row's place in its file, the same whether the file is read alone (a shard) or among others.
    /// </summary>
    public long BatchFirstRowInFile { get; private set; }

    /// <summary>Batches read by the last (or current) <see cref="ReadBatches"/> enumeration.</summary>
    public int BatchesRead { get; private set; }

    /// <summary>
    /// Opens every file's schema (GATE2001 missing, GATE2002 unreadable, GATE0001 a file listed twice, which would
    /// count its events twice) and, when there are several, digests every file's content (GATE2204 two files alike: a
    /// copy under another name).
    /// </summary>
    public static Sample Open(IReadOnlyList<string> files) => Open(files, KeptMetadataBytes);

    /// <summary>As <see cref="Open(IReadOnlyList{string})"/>, keeping what opening read up to <paramref name="keptMetadataBytes"/>.</summary>
    internal static Sample Open(IReadOnlyList<string> files, long keptMetadataBytes)
    {
        if (files.Count == 0)
            throw new GateInputException(ErrorCodes.SampleNotFound, "the sample has no files");

        var seen = new HashSet<string>(StringComparer.Ordinal);
        var columns = new IReadOnlyList<SampleColumn>[files.Count];
        var readers = new ISampleReader?[files.Count];
        long kept = 0;
        long? totalRows = 0;
        for (var i = 0; i < files.Count; i++)
        {
            if (!seen.Add(Path.GetFullPath(files[i])))
                throw new GateInputException(ErrorCodes.Usage,
                    $"sample file '{files[i]}' is listed twice; its events would be counted twice",
                    new SourceLocation(files[i]));
            var reader = SampleReaderFactory.Open(files[i]);
            columns[i] = reader.Columns;
            totalRows = totalRows is { } t && reader.RowCount is { } r ? t + r : null;
            if (kept + reader.MetadataBytes <= keptMetadataBytes)
            {
                readers[i] = reader;
                kept += reader.MetadataBytes;
            }
            else reader.Dispose();
        }
        var sample = new Sample(files.ToArray(), columns, readers, totalRows);
        if (files.Count > 1) _ = sample.Shards;
        return sample;
    }

    /// <summary>
    /// Reads <paramref name="columns"/> from every file in order. Every file must have every column as a numeric
    /// column; this is checked for all files before any data is read, so a mismatch in the last file fails at once.
    /// Batches and their buffers are only valid until the next one is requested. <paramref name="pass"/> says what the
    /// pass is for, who is told its progress and how many threads it may use (default: <see cref="ReadPass.Default"/>).
    /// </summary>
    public IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns, ReadPass? pass = null)
    {
        for (var i = 0; i < Files.Count; i++)
            SampleColumnLookup.IndicesOf(Files[i], _fileColumns[i], columns, PresenceNote(columns, i));
        return Batches(columns, pass ?? ReadPass.Default);
    }

    private IEnumerable<SampleBatch> Batches(IReadOnlyList<string> columns, ReadPass pass)
    {
        RowsRead = 0;
        BatchesRead = 0;
        var clock = System.Diagnostics.Stopwatch.StartNew();
        for (var i = 0; i < Files.Count; i++)
        {
            var file = Files[i];
            CurrentFile = file;
            using var reopened = _readers[i] is null ? SampleReaderFactory.Open(file) : null;
            var reader = _readers[i] ?? reopened!;
            long inFile = 0;
            foreach (var batch in reader.ReadBatches(columns, pass.Parallelism, pass.OnDecoded, pass.UnreadOnceTaken))
            {
                BatchFirstRowInFile = inFile;
                inFile += batch.RowCount;
                RowsRead += batch.RowCount;
                BatchesRead++;
                yield return batch;
                pass.Progress?.Report(new ReadProgress(pass.Phase, RowsRead, TotalRows, clock.Elapsed, false));
            }
        }
        pass.Progress?.Report(new ReadProgress(pass.Phase, RowsRead, TotalRows, clock.Elapsed, true));
    }

    // For a column missing from one file: say how many of the others have it, since that usually means a stray file.
    private string PresenceNote(IReadOnlyList<string> columns, int file)
    {
        var missing = columns.FirstOrDefault(c => _fileColumns[file].All(s => s.Name != c));
        if (missing is null || Files.Count == 1) return "";
        var having = _fileColumns.Count(fc => fc.Any(s => s.Name == missing));
        return having == 0 ? "" : $"; {having} of the sample's {Files.Count} files {(having == 1 ? "has" : "have")} it";
    }

    private static SampleColumn[] CommonColumns(IReadOnlyList<SampleColumn>[] fileColumns) =>
        fileColumns[0]
            .Where(c => fileColumns.All(f => f.Any(o => o.Name == c.Name)))
            .ToArray();
}
