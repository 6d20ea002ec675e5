namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Finds the cell of a value on one projection's fixed edges (cell 0 below the lowest edge, cell i for
/// edges[i−1] ≤ x &lt; edges[i], cell edges.Length at or above the highest), which is the number of edges ≤ x, in
/// about constant time whatever the grid's tails.
/// <para>
/// A guide table (Chen &amp; Asau 1974) of 2·edges.Length equal slots covers a core [edges[lo], edges[hi]), chosen from
/// the edges themselves: it starts as the whole grid and gives up its widest outer gap while some slot holds more than
/// two edges, so a long tail no longer widens the slots of the dense middle (a table over the whole range of a
/// long-tailed projection left hundreds of edges in one slot). Each slot stores the cell of its lowest value, found by
/// putting every edge through the very slot function the lookup uses (monotone in x), so the edges inside a slot are
/// exactly those between its entry and the next slot's; a slot with at most two takes two comparisons without a
/// branch, a fuller one a binary search over its own edges, and a value outside the core a binary search over the
/// tail's edges. Every cell is fixed by comparisons with the edges themselves: the table only bounds the search.
/// </para>
/// </summary>
internal sealed class SlicedCellLookup
{
    private readonly double[] _edges;
    private readonly int[] _first; // per slot s: the cell of the slot's lowest value; slot s holds edges _first[s] … _first[s + 1] − 1
    private readonly double _low;  // edges[lo]
    private readonly double _high; // edges[hi]
    private readonly double _perSlot;
    private readonly int _slots;
    private readonly int _lo;
    private readonly int _hi;
    private readonly bool _sparse; // no slot holds more than two edges

    public SlicedCellLookup(double[] edges)
    {
        if (edges.Length < 2) throw new ArgumentException("A projection's grid needs at least two edges.", nameof(edges));
        for (var i = 0; i < edges.Length; i++)
        {
            if (!double.IsFinite(edges[i])) throw new ArgumentException($"Edge {i} is {edges[i]}.", nameof(edges));
            if (i > 0 && !(edges[i] > edges[i - 1])) throw new ArgumentException($"Edges must increase strictly (edge {i}).", nameof(edges));
        }
        _edges = edges;
        _slots = 2 * edges.Length;
        int lo = 0, hi = edges.Length - 1;
        // Narrow the core from its wider outer gap while a slot holds more than two edges, keeping at least half the
        // edges (a cluster the table cannot split is searched within its slot).
        while (true)
        {
            var perSlot = PerSlot(edges[lo], edges[hi]);
            if (FullestSlot(edges, lo, hi, perSlot) <= 2 || hi - lo <= edges.Length / 2) break;
            if (edges[lo + 1] - edges[lo] >= edges[hi] - edges[hi - 1]) lo++;
            else hi--;
        }
        _lo = lo;
        _hi = hi;
        _low = edges[lo];
        _high = edges[hi];
        _perSlot = PerSlot(_low, _high);
        _first = new int[_slots + 2];
        // Slot s's entry: lo + 1 (the edges up to edges[lo] lie at or below every core value) plus the inner edges whose
        // slot is below s; the slot function is monotone, so those are exactly the inner edges below the slot's values.
        var e = lo + 1;
        for (var s = 0; s < _first.Length; s++)
        {
            while (e < hi && Slot(edges[e]) < s) e++;
            _first[s] = e;
        }
        _sparse = true;
        for (var s = 0; s <= _slots; s++) _sparse &= _first[s + 1] - _first[s] <= 2;
    }

    private double PerSlot(double low, double high)
    {
        var perSlot = _slots / (high - low);
        return double.IsFinite(perSlot) ? perSlot : 0; // a core too wide or too narrow for the table: one slot, searched
    }

    private static int FullestSlot(double[] edges, int lo, int hi, double perSlot)
    {
        int fullest = 0, run = 0, previous = -1;
        for (var i = lo + 1; i < hi; i++)
        {
            var s = SlotOf(edges[i], edges[lo], perSlot, int.MaxValue);
            run = s == previous ? run + 1 : 1;
            previous = s;
            fullest = Math.Max(fullest, run);
        }
        return fullest;
    }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    private static int SlotOf(double x, double low, double perSlot, int slots)
    {
        var t = (x - low) * perSlot;
        return t < slots ? (int)t : slots; // t ≥ 0 for x ≥ low; the comparison keeps the conversion in range
    }

    private int Slot(double x) => SlotOf(x, _low, _perSlot, _slots);

    /// <summary>The edges, lowest first.</summary>
    public double[] Edges => _edges;

    /// <summary>The number of cells, flows included: edges.Length + 1.</summary>
    public int Cells => _edges.Length + 1;

    /// <summary>The cell of a finite value.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public int Cell(double x)
    {
        if (x >= _low && x < _high)
        {
            var s = SlotOf(x, _low, _perSlot, _slots);
            var c = _first[s];
            var end = _first[s + 1];
            if (end - c <= 2)
            {
                // edges[c] exists: c ≤ hi, and x < edges[hi] stops the count there.
                c += x >= _edges[c] ? 1 : 0;
                c += x >= _edges[c] ? 1 : 0;
                return c;
            }
            return Count(x, c, end);
        }
        return x < _low ? Count(x, 0, _lo) : Count(x, _hi + 1, _edges.Length);
    }

    /// <summary>
    /// The cells of many finite values (<see cref="Cell"/> for each; any other value gets some cell and must be left
    /// out by the caller). The core's path is written out with the table and edges in locals and without range checks,
    /// as it runs K times a row: with a table, edges[hi] − edges[lo] is finite and for x in [edges[lo], edges[hi]) the
    /// slot (x − edges[lo])·perSlot is below slots + 1 (both roundings are monotone and
    /// (edges[hi] − edges[lo])·perSlot rounds to slots), so it indexes the table directly, and the entry and the one
    /// after it lie in [lo + 1, hi].
    /// </summary>
    public void CellsOf(ReadOnlySpan<double> values, Span<int> cells)
    {
        if (cells.Length < values.Length) throw new ArgumentException("Too few cells for the values.", nameof(cells));
        if (_perSlot == 0)
        {
            // No table (a core too wide or too narrow for one): x − edges[lo] may overflow, so every value is searched.
            for (var r = 0; r < values.Length; r++) cells[r] = Cell(values[r]);
            return;
        }
        double low = _low, high = _high, perSlot = _perSlot;
        ref var first = ref System.Runtime.InteropServices.MemoryMarshal.GetArrayDataReference(_first);
        ref var edges = ref System.Runtime.InteropServices.MemoryMarshal.GetArrayDataReference(_edges);
        ref var x0 = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(values);
        ref var c0 = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(cells);
        for (var r = 0; r < values.Length; r++)
        {
            var x = System.Runtime.CompilerServices.Unsafe.Add(ref x0, r);
            int c;
            if (x >= low && x < high)
            {
                var t = (x - low) * perSlot;
                var s = System.Runtime.Intrinsics.X86.Sse2.IsSupported
                    ? System.Runtime.Intrinsics.X86.Sse2.ConvertToInt32WithTruncation(System.Runtime.Intrinsics.Vector128.CreateScalarUnsafe(t))
                    : (int)t;
                c = System.Runtime.CompilerServices.Unsafe.Add(ref first, s);
                if (_sparse || System.Runtime.CompilerServices.Unsafe.Add(ref first, s + 1) - c <= 2)
                {
                    c += x >= System.Runtime.CompilerServices.Unsafe.Add(ref edges, c) ? 1 : 0;
                    c += x >= System.Runtime.CompilerServices.Unsafe.Add(ref edges, c) ? 1 : 0;
                }
                else c = Count(x, c, System.Runtime.CompilerServices.Unsafe.Add(ref first, s + 1));
            }
            else c = Cell(x);
            System.Runtime.CompilerServices.Unsafe.Add(ref c0, r) = c;
        }
    }

    /// <summary>The number of edges ≤ x, knowing that edges below <paramref name="from"/> are ≤ x and edges from <paramref name="to"/> on are above it.</summary>
    private int Count(double x, int from, int to)
    {
        while (from < to)
        {
            var mid = (from + to) >>> 1;
            if (x >= _edges[mid]) from = mid + 1;
            else to = mid;
        }
        return from;
    }
}
