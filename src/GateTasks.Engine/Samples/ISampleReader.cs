namespace GateTasks.Engine.Samples;

/// <summary>
/// Streams numeric columns of one sample file in batches (a Parquet row group, a block of CSV lines),
/// so memory is bounded by the batch size, never by the number of events.
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
    /// Reads the named columns batch by batch. Every value is converted to <see cref="double"/>;
    /// a null (missing) value becomes NaN. A name not in <see cref="Columns"/> throws
    /// <see cref="Diagnostics.GateInputException"/> with code GATE2004 and the nearest valid name.
    /// The returned batch and its arrays may be reused by the next iteration.
    /// </summary>
    IEnumerable<SampleBatch> ReadBatches(IReadOnlyList<string> columns);
}
