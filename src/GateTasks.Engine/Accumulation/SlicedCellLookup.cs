namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Finds the cell of a value on one projection's fixed edges (cell 0 below the lowest edge, cell i for
/// edges[i−1] ≤ x &lt; edges[i], cell edges.Length at or above the highest) in about constant time: a table over
/// 4·edges.Length equal slots between the outermost edges gives the cell at each slot's start, and a short walk over
/// the edges finishes (on an equal-probability grid of a roughly normal projection a slot spans about one cell; a
/// binary search over 500 edges took several times longer). The walk compares with the edges themselves, so the
/// table only speeds the search up and cannot change a cell.
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
        _slots = 4 * edges.Length;
        _perSlot = _slots / (_high - _low);
        if (!double.IsFinite(_perSlot)) _perSlot = 0; // a range too wide for the table: every value walks from the first edge
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
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public int Cell(double x)
    {
        if (x < _low) return 0;
        if (x >= _high) return _edges.Length;
        var s = (int)((x - _low) * _perSlot);
        var c = _first[Math.Min(s, _slots)];
        // Walk up to the first edge above x (x < the highest edge, so this stops), then down past any edge above x that
        // rounding in the slot's index let through: the cell is then exactly edges[c − 1] ≤ x < edges[c]. The first
        // two steps are taken without a branch (most slots need one or two), which halved the time of the walk.
        c += x >= _edges[c] ? 1 : 0;
        c += x >= _edges[c] ? 1 : 0;
        while (x >= _edges[c]) c++;
        while (c > 1 && x < _edges[c - 1]) c--;
        return c;
    }
}
