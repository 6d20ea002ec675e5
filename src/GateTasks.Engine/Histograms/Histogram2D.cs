namespace GateTasks.Engine.Histograms;

/// <summary>
/// A two-dimensional weighted histogram: two axes plus one storage of (n_x + 2) × (n_y + 2) cells (flows included
/// on both axes, row-major by the first axis). Pairs with a NaN in either value are counted apart.
/// </summary>
internal sealed class Histogram2D
{
    public Histogram2D(Axis x, Axis y)
    {
        X = x;
        Y = y;
        _storage = WeightedStorage.OfCells((x.Count + 2) * (y.Count + 2));
    }

    // Σw and Σw² per cell; cell (i, j) of the flow-extended axes is i·(n_y + 2) + j.
    private readonly WeightedStorage _storage;

    public Axis X { get; }
    public Axis Y { get; }

    /// <summary>Number of cells, (n_x + 2) × (n_y + 2), flows included.</summary>
    public int CellCount => _storage.CellCount;

    /// <summary>Adds the cells exactly into <paramref name="cells"/> (of <see cref="CellCount"/> cells) and clears them.</summary>
    public void MoveCellsInto(ExactCells cells) => cells.Absorb(_storage);

    public long NanEntries { get; private set; }

    /// <summary>
    /// Adds a block of pairs, none NaN (weights empty: unit weights): each axis finds its cells for the whole block
    /// (<see cref="Axis.Cells(ReadOnlySpan{double}, Span{int}, int)"/>), sparing a virtual call per value, then each pair adds to its cell.
    /// </summary>
    public void Fill(ReadOnlySpan<double> x, ReadOnlySpan<double> y, ReadOnlySpan<double> w)
    {
        if (_rows.Length < x.Length) (_rows, _columns) = (new int[x.Length], new int[x.Length]);
        var rows = _rows.AsSpan(0, x.Length);
        var columns = _columns.AsSpan(0, x.Length);
        X.Cells(x, rows, 0);
        Y.Cells(y, columns, 0);
        var stride = Y.Count + 2;
        for (var r = 0; r < rows.Length; r++) _storage.Add(rows[r] * stride + columns[r], w.IsEmpty ? 1.0 : w[r]);
    }

    private int[] _rows = [], _columns = [];

    /// <summary>
    /// Adds a block of pairs whose cells on finer axes are known: <paramref name="rowOf"/> and <paramref name="columnOf"/>
    /// map those storage cells to this histogram's (each finer cell lying in one of these), so no value is searched again.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void FillCells(ReadOnlySpan<int> rows, ReadOnlySpan<int> columns, int[] rowOf, int[] columnOf, ReadOnlySpan<double> w)
    {
        var stride = Y.Count + 2;
        if (w.IsEmpty)
        {
            // Unit weights: counted in integers (AddCounts).
            if (_counts.Length < CellCount) _counts = new int[CellCount];
            var counts = _counts;
            for (var r = 0; r < rows.Length; r++) counts[rowOf[rows[r]] * stride + columnOf[columns[r]]]++;
            AddCounts();
            return;
        }
        for (var r = 0; r < rows.Length; r++) _storage.Add(rowOf[rows[r]] * stride + columnOf[columns[r]], w[r]);
    }

    private int[] _counts = [];

    /// <summary>
    /// Adds a block of unit-weight pairs whose storage cells on this histogram's own axes are known (none NaN): the
    /// same sums as <see cref="FillCells"/> with maps that change nothing, without looking the maps up.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void CountCells(ReadOnlySpan<int> rows, ReadOnlySpan<int> columns)
    {
        if (_counts.Length < CellCount) _counts = new int[CellCount];
        var counts = _counts;
        var stride = Y.Count + 2;
        for (var r = 0; r < rows.Length; r++) counts[rows[r] * stride + columns[r]]++;
        AddCounts();
    }

    // Unit weights: a cell's Σw and Σw² grow by its count of ones, an integer a double holds exactly, so a block is
    // counted in integers and each cell's count added once (the same sums as one by one).
    private void AddCounts()
    {
        var counts = _counts;
        for (var c = 0; c < CellCount; c++)
            if (counts[c] != 0)
            {
                _storage.AddCount(c, counts[c]);
                counts[c] = 0;
            }
    }

    public void Fill(double x, double y, double w = 1.0)
    {
        if (double.IsNaN(x) || double.IsNaN(y)) { NanEntries++; return; }
        // Each axis's underflow is row/column 0, its overflow the last (axis index + 1), as in a 1-D histogram.
        var i = X.Index(x) + 1;
        var j = Y.Index(y) + 1;
        _storage.Add(i * (Y.Count + 2) + j, w);
    }
}
