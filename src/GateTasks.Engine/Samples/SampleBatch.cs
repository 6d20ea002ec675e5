namespace GateTasks.Engine.Samples;

/// <summary>
/// A block of rows of the requested columns, as doubles. A reader may hand its columns over in their stored types
/// (<see cref="IStoredBatchColumns"/>); a column is then converted into its buffer the first time it is asked for, by
/// whichever thread asks first (the others wait for it), so columns that are never read as doubles are never converted.
/// </summary>
internal sealed class SampleBatch
{
    private readonly double[][] _columns;
    private readonly IStoredBatchColumns? _stored;
    private readonly int[]? _converted; // per column: 1 once its buffer holds this batch's values

    /// <summary>
    /// Creates a batch over column buffers; each buffer holds at least <paramref name="rowCount"/> values, or is filled
    /// from <paramref name="stored"/> when first read.
    /// </summary>
    public SampleBatch(double[][] columns, int rowCount, IStoredBatchColumns? stored = null)
    {
        _columns = columns;
        RowCount = rowCount;
        _stored = stored;
        _converted = stored is null ? null : new int[columns.Length];
    }

    /// <summary>
    /// Finds where a cell was read from, for a message about a bad value; null where the reader cannot say. Like the
    /// buffers, valid only until the next batch is requested. Called on error paths only.
    /// </summary>
    public CellLocator? Locate { get; init; }

    /// <summary>Rows in this batch.</summary>
    public int RowCount { get; }

    /// <summary>Number of columns (in the order they were requested).</summary>
    public int ColumnCount => _columns.Length;

    /// <summary>The buffer behind the <paramref name="index"/>-th column (at least <see cref="RowCount"/> long), for column-wise evaluators.</summary>
    public double[] ColumnBuffer(int index)
    {
        Convert(index);
        return _columns[index];
    }

    /// <summary>
    /// The buffer <see cref="ColumnBuffer"/> gives, before its values are there: they are written by
    /// <see cref="Convert"/>, which must be called before the buffer is read.
    /// </summary>
    public double[] DeferredBuffer(int index) => _columns[index];

    /// <summary>The values of the <paramref name="index"/>-th requested column.</summary>
    public ReadOnlySpan<double> Column(int index) => ColumnBuffer(index).AsSpan(0, RowCount);

    /// <summary>
    /// The <paramref name="index"/>-th column's values as stored, where they are float32 without a null (the same
    /// numbers as <see cref="Column"/>, without the conversion); else empty.
    /// </summary>
    public ReadOnlySpan<float> Float32Column(int index) => _stored is null ? ReadOnlySpan<float>.Empty : _stored.Float32(index);

    /// <summary>Whether the <paramref name="index"/>-th column's values were already taken as they were decoded (<see cref="DecodedFloat32Slice"/>).</summary>
    public bool TakenOnDecoding(int index) => _stored is not null && _stored.TakenOnDecoding(index);

    /// <summary>Makes sure the column's buffer holds this batch's values; safe to call from several threads.</summary>
    public void Convert(int index)
    {
        if (_converted is null || Volatile.Read(ref _converted[index]) != 0) return;
        lock (_columns[index])
        {
            if (_converted[index] != 0) return;
            _stored!.Convert(index, _columns[index].AsSpan(0, RowCount));
            Volatile.Write(ref _converted[index], 1);
        }
    }
}
