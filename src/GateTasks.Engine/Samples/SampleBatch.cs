namespace GateTasks.Engine.Samples;

/// <summary>A block of rows of the requested columns, converted to doubles.</summary>
internal sealed class SampleBatch
{
    private readonly double[][] _columns;

    /// <summary>Creates a batch over column buffers; each buffer holds at least <paramref name="rowCount"/> values.</summary>
    public SampleBatch(double[][] columns, int rowCount)
    {
        _columns = columns;
        RowCount = rowCount;
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
    public double[] ColumnBuffer(int index) => _columns[index];

    /// <summary>The values of the <paramref name="index"/>-th requested column.</summary>
    public ReadOnlySpan<double> Column(int index) => _columns[index].AsSpan(0, RowCount);
}
