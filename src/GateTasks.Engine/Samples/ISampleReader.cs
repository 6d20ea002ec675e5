namespace GateTasks.Engine.Samples;

/// <summary>
/// One sample file, opened once: its schema is read and checked when it is opened and kept for every read. Streams
/// numeric columns of the file in batches (a Parquet row group, a block of CSV lines), so memory is bounded by the
/// batch size, never by the number of events. No file handle is held between reads: each read opens the file and
/// closes it when its enumeration ends, and refuses a file that changed since it was opened (GATE2002).
/// </summary>
internal interface ISampleReader : IDisposable
{
    /// <summary>The file being read.</summary>
    string Path { get; }

    /// <summary>Rows in the file, when the format states it up front (Parquet does, CSV does not).</summary>
    long? RowCount { get; }

    /// <summary>Every column of the file with its stored type, in file order.</summary>
    IReadOnlyList<SampleColumn> Columns { get; }

    /// <summary>
    /// The stored size of the file metadata this reader keeps in memory between reads (a Parquet footer; 0 for CSV),
    /// so a sample of many files can bound what it keeps.
    /// </summary>
    long MetadataBytes { get; }

    /// <summary>
    /// Reads the named columns batch by batch. Every value is converted to <see cref="double"/>;
    /// a null (missing) value becomes NaN. A name not in <see cref="Columns"/> throws
    /// <see cref="Diagnostics.GateInputException"/> with code GATE2004 and the nearest valid name.
    /// The returned batch and its arrays may be reused by the next iteration. Up to <paramref name="parallelism"/>
    /// threads may decode (Parquet decodes a row group's columns side by side); the batches do not depend on it.
    /// </summary>
    IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns, int parallelism = 1);

    /// <summary>
    /// As <see cref="ReadBatches(IReadOnlyList{string}, int)"/>, offering each float32 column's slices to
    /// <paramref name="onDecoded"/> as soon as they are decoded; a reader that decodes no such columns ignores it.
    /// <paramref name="unreadOnceTaken"/> (per requested column; null: none) marks the columns whose slices, once taken
    /// on decoding, are never asked for again, neither as doubles nor as stored: the reader may then reuse their memory.
    /// </summary>
    IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns, int parallelism, DecodedFloat32Slice? onDecoded,
        IReadOnlyList<bool>? unreadOnceTaken = null) =>
        ReadBatches(columns, parallelism);
}
