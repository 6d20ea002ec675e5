namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Finds the cell of a value on one projection's fixed edges (cell 0 below the lowest edge, cell i for
/// edges[i−1] ≤ x &lt; edges[i], cell edges.Length at or above the highest) in about constant time: a table over
/// 2·edges.Length equal slots between the outermost edges gives the first and last cell a slot can hold, and a
/// binary search runs only between those two (on an equal-probability grid most slots hold one or two cells). The
/// answer is always checked against the edges, so the table only speeds the search up and cannot change a cell.
/// </summary>
internal sealed class SlicedCellLookup
{
    private readonly double[] _edges;
    private readonly int[] _first; // per slot: the cell of the slot's lower end; slot s + 1's entry bounds slot s
    private readonly double _low;
    private readonly double _high;
    private readonly double _perSlot;
    private readonly int _slots;

    public SlicedCellLookup(double[] edges)
    {
        if (edges.Length < 2) throw new ArgumentException("A projection's grid needs at least two edges.", nameof(edges));
        for (var i = 0; i < edges.Length; i++)
        {
            if (!double.IsFinite(edges[i])) throw new ArgumentException($"Edge {i} is {edges[i]}.", nameof(edges));
            if (i > 0 && !(edges[i] > edges[i - 1])) throw new ArgumentException($"Edges must increase strictly (edge {i}).", nameof(edges));
        }
        _edges = edges;
        _low = edges[0];
        _high = edges[^1];
        _slots = 2 * edges.Length;
        _perSlot = _slots / (_high - _low);
        if (!double.IsFinite(_perSlot)) _perSlot = 0; // edges too close for the table: every value takes the full search
        _first = new int[_slots + 2];
        var c = 1;
        for (var s = 0; s <= _slots + 1; s++)
        {
            var start = _low + s / _perSlot;
            while (c < edges.Length - 1 && edges[c] <= start) c++;
            _first[s] = Math.Max(1, c - 1); // one cell of slack either side for rounding in start and in the slot index
        }
    }

    /// <summary>The edges, lowest first.</summary>
    public double[] Edges => _edges;

    /// <summary>The number of cells, flows included: edges.Length + 1.</summary>
    public int Cells => _edges.Length + 1;

    /// <summary>The cell of a finite value.</summary>
    public int Cell(double x)
    {
        if (x < _low) return 0;
        if (x >= _high) return _edges.Length;
        int lo = 1, hi = _edges.Length - 1; // the cell is in [lo, hi]: edges[c − 1] ≤ x < edges[c]
        var s = (int)((x - _low) * _perSlot);
        if ((uint)s < (uint)_slots)
        {
            lo = _first[s];
            hi = Math.Min(_edges.Length - 1, _first[s + 1] + 1);
            if (x < _edges[lo - 1] || x >= _edges[hi]) { lo = 1; hi = _edges.Length - 1; }
        }
        while (lo < hi)
        {
            var mid = (lo + hi) >> 1;
            if (x < _edges[mid]) hi = mid;
            else lo = mid + 1;
        }
        return lo;
    }
}
