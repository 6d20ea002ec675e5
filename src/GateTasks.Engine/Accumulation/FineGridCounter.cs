using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// A feature's weight on the reference's fine equal-probability grid (a few thousand cells; see
/// <see cref="FineGridCells"/>), with the first moments of the open tails: Σw·(e₀ − x) below the lowest edge and
/// Σw·(x − e_last) at or above the highest, and their Σw²·d². ∫F dt below e₀ is exactly Σw·(e₀ − x)/Σw (and ∫(1 − F)
/// above e_last likewise), so the Wasserstein distance need not guess how the tails are spread. Every sum is exact, so
/// shards merge to the bits of one pass; memory depends on the grid, not on the sample.
/// </summary>
internal sealed class FineGridCounter
{
    private readonly Axis _axis;
    // The weighted path's per-batch histogram and the exact cells, made when first needed: a check of float32 values
    // with unit weights needs neither (its counts are exact as they are), which spares 20 fine grids' thousands of
    // exact sums (about 18 MB) at start-up.
    private Histogram? _batch;
    private ExactHistogram? _cells;
    // Unit-weight counts of float batches, kept across batches (a count is exact, so adding it to the exact cells once
    // gives the bits of adding each batch's), and moved into _cells before anything reads them or a weighted batch comes.
    private readonly long[] _unitCounts;
    private long _unitEntries;
    // Below: Σw·d, Σw²·d²; above: Σw·d, Σw²·d² — summed per batch, then exactly.
    private readonly ExactSum[] _tails = Enumerable.Range(0, 4).Select(_ => new ExactSum()).ToArray();

    public FineGridCounter(IReadOnlyList<double> edges)
    {
        _axis = Axis.FromEdges(edges);
        _unitCounts = new long[_axis.Count + 2];
    }

    private ExactHistogram Cells => _cells ??= new ExactHistogram(_axis);

    /// <summary>
    /// Adds a batch. Values that are not finite are left out: NaN and ±∞ are counted apart by the feature's statistics
    /// (and refused or set aside there), and an infinite value has no distance to integrate.
    /// </summary>
    public void Add(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        var finite = true;
        foreach (var x in values)
            if (!double.IsFinite(x)) { finite = false; break; }
        if (!finite)
        {
            var v = new List<double>(values.Length);
            var w = new List<double>(weights.Length);
            for (var i = 0; i < values.Length; i++)
            {
                if (!double.IsFinite(values[i])) continue;
                v.Add(values[i]);
                if (!weights.IsEmpty) w.Add(weights[i]);
            }
            AddFinite(v.ToArray(), w.ToArray());
            return;
        }
        AddFinite(values, weights);
    }

    /// <summary>
    /// Adds a batch of float32 values with unit weights: the same cells and tail sums as <see cref="Add(ReadOnlySpan{double}, ReadOnlySpan{double})"/>
    /// with the values widened (exact), found among float edges (<see cref="Axis.Cells(ReadOnlySpan{float}, Span{int}, int)"/>)
    /// and counted in integers; the tails are summed in the same order, from the cells that lie beyond the outermost edges.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Add(ReadOnlySpan<float> values)
    {
        if (!AllFinite(values))
        {
            var v = new List<double>(values.Length);
            foreach (var x in values)
                if (float.IsFinite(x)) v.Add(x);
            AddFinite(v.ToArray(), ReadOnlySpan<double>.Empty);
            return;
        }
        var axis = _axis;
        var overflow = axis.Count + 1;
        double lo = axis.Edges[0], hi = axis.Edges[^1];
        double belowW = 0, belowW2 = 0, aboveW = 0, aboveW2 = 0;
        var counts = _unitCounts;
        Span<int> cells = stackalloc int[Math.Min(values.Length, Block)];
        for (var start = 0; start < values.Length; start += Block)
        {
            var block = values.Slice(start, Math.Min(Block, values.Length - start));
            var blockCells = cells[..block.Length];
            axis.Cells(block, blockCells, overflow + 1);
            var (under, over) = (counts[0], counts[overflow]);
            foreach (var c in blockCells) counts[c]++;
            // Values beyond the outermost edges are rare (those edges hold the whole reference): look for them only
            // in a block that has some, in the values' order, so the tail sums are added as before.
            if (counts[0] == under && counts[overflow] == over) continue;
            AddTailTerms(block, blockCells, null, overflow, lo, hi, ref belowW, ref belowW2, ref aboveW, ref aboveW2);
        }
        _unitEntries += values.Length;
        AddTails(belowW, belowW2, aboveW, aboveW2);
    }

    /// <summary>
    /// Adds a batch of float32 values with unit weights to this grid and to the feature's histogram
    /// <paramref name="coarse"/>, with one search for both (<see cref="UnionEdgeSearch"/>): the same cells, counts and
    /// tail sums, in the same order, as <see cref="Add(ReadOnlySpan{float})"/> and <see cref="Histogram.Fill(ReadOnlySpan{float})"/>
    /// one after the other. False, with nothing added, where a value is not finite (NaN and ±∞ go their own ways) or
    /// the machine lacks the SIMD search: the caller then fills each on its own.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public bool Add(ReadOnlySpan<float> values, Histogram coarse)
    {
        if (!UnionEdgeSearch.IsSupported || !AllFinite(values)) return false;
        var shared = SharedWith(coarse.Axis);
        var union = shared.Search;
        var counts = shared.Counts;
        var fineCells = union.SecondCells;
        var overflow = _axis.Count + 1;
        // Union cells below the fine grid's first edge are [0, below); those at or above its last, [above, end).
        var (below, above) = (shared.Below, shared.Above);
        double lo = _axis.Edges[0], hi = _axis.Edges[^1];
        double belowW = 0, belowW2 = 0, aboveW = 0, aboveW2 = 0;
        Span<int> cells = stackalloc int[Math.Min(values.Length, Block)];
        for (var start = 0; start < values.Length; start += Block)
        {
            var block = values.Slice(start, Math.Min(Block, values.Length - start));
            var blockCells = cells[..block.Length];
            union.Cells(block, blockCells);
            var outside = Outside(counts, below, above);
            foreach (var c in blockCells) counts[c]++;
            // As in the float fill: the tails are summed only in a block that reaches them, in the values' order.
            if (Outside(counts, below, above) == outside) continue;
            AddTailTerms(block, blockCells, fineCells, overflow, lo, hi, ref belowW, ref belowW2, ref aboveW, ref aboveW2);
        }
        // Each union cell's count into the cells of both axes that hold it (exact integer sums).
        var coarseCells = union.FirstCells;
        var coarseCounts = shared.CoarseCounts;
        var fineCounts = _unitCounts;
        for (var u = 0; u < counts.Length; u++)
        {
            var k = counts[u];
            if (k == 0) continue;
            fineCounts[fineCells[u]] += k;
            coarseCounts[coarseCells[u]] += k;
            counts[u] = 0;
        }
        coarse.AddUnitCounts(coarseCounts, values.Length);
        _unitEntries += values.Length;
        AddTails(belowW, belowW2, aboveW, aboveW2);
        return true;
    }

    // How many values so far fell in the union cells beyond the fine grid's outermost edges.
    private static long Outside(long[] counts, int below, int above)
    {
        var n = 0L;
        for (var u = 0; u < below; u++) n += counts[u];
        for (var u = above; u < counts.Length; u++) n += counts[u];
        return n;
    }

    // The union search with a histogram's axis, made for the first axis it meets (a feature keeps its axis); with
    // per-union-cell counts of one batch and the histogram's cell counts, both zero between batches.
    private SharedSearch SharedWith(Axis coarse)
    {
        if (_shared is { } s && ReferenceEquals(s.Coarse, coarse)) return s;
        var union = new UnionEdgeSearch(coarse.Edges, _axis.Edges);
        var fineCells = union.SecondCells;
        var below = 0;
        while (below < fineCells.Length && fineCells[below] == 0) below++;
        var above = fineCells.Length;
        while (above > 0 && fineCells[above - 1] == _axis.Count + 1) above--;
        return _shared = new SharedSearch(coarse, union, new long[union.CellCount], new long[coarse.Count + 2], below, above);
    }

    private SharedSearch? _shared;

    private sealed record SharedSearch(Axis Coarse, UnionEdgeSearch Search, long[] Counts, long[] CoarseCounts, int Below, int Above);

    // The tails' distances beyond the outermost edges, in the values' order: of the values whose grid cell (through
    // map, where the cells are another axis's) is the underflow (0) or the overflow.
    private static void AddTailTerms(ReadOnlySpan<float> block, ReadOnlySpan<int> cells, int[]? map, int overflow, double lo, double hi,
        ref double belowW, ref double belowW2, ref double aboveW, ref double aboveW2)
    {
        for (var i = 0; i < cells.Length; i++)
        {
            var c = map is null ? cells[i] : map[cells[i]];
            if (c == 0)
            {
                var d = lo - block[i];
                belowW += d;
                belowW2 += d * d;
            }
            else if (c == overflow)
            {
                var d = block[i] - hi;
                aboveW += d;
                aboveW2 += d * d;
            }
        }
    }

    /// <summary>Values whose cells are found in one call.</summary>
    private const int Block = 512;

    // Whether every value is finite: x − x is 0 for a finite x and NaN for NaN and ±∞.
    private static bool AllFinite(ReadOnlySpan<float> values)
    {
        var i = 0;
        var finite = System.Numerics.Vector<int>.AllBitsSet;
        for (; i + System.Numerics.Vector<float>.Count <= values.Length; i += System.Numerics.Vector<float>.Count)
        {
            var v = new System.Numerics.Vector<float>(values[i..]);
            finite &= System.Numerics.Vector.Equals(v - v, System.Numerics.Vector<float>.Zero);
        }
        if (finite != System.Numerics.Vector<int>.AllBitsSet) return false;
        for (; i < values.Length; i++)
            if (!float.IsFinite(values[i])) return false;
        return true;
    }

    // Moves the unit-weight counts into the exact cells.
    private void FlushUnitCounts()
    {
        if (_unitEntries == 0) return;
        var sums = new double[_unitCounts.Length];
        for (var c = 0; c < sums.Length; c++) sums[c] = _unitCounts[c];
        Cells.Absorb(Histogram.FromCells(_axis, sums, sums, _unitEntries, 0, 0, 0));
        Array.Clear(_unitCounts);
        _unitEntries = 0;
    }

    private void AddTails(double belowW, double belowW2, double aboveW, double aboveW2)
    {
        double[] batch = [belowW, belowW2, aboveW, aboveW2];
        for (var k = 0; k < batch.Length; k++)
            if (batch[k] != 0) _tails[k].Add(batch[k]);
    }

    private void AddFinite(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        FlushUnitCounts();
        var batch = _batch ??= new Histogram(_axis);
        batch.Fill(values, weights);
        Cells.Absorb(batch);
        var edges = _axis.Edges;
        double lo = edges[0], hi = edges[^1];
        double belowW = 0, belowW2 = 0, aboveW = 0, aboveW2 = 0;
        for (var i = 0; i < values.Length; i++)
        {
            var x = values[i];
            if (x < lo)
            {
                var w = weights.IsEmpty ? 1.0 : weights[i];
                var d = lo - x;
                belowW += w * d;
                belowW2 += w * w * d * d;
            }
            else if (x >= hi)
            {
                var w = weights.IsEmpty ? 1.0 : weights[i];
                var d = x - hi;
                aboveW += w * d;
                aboveW2 += w * w * d * d;
            }
        }
        AddTails(belowW, belowW2, aboveW, aboveW2);
    }

    /// <summary>Adds another counter's sums (same grid; exact).</summary>
    public void Merge(FineGridCounter other)
    {
        FlushUnitCounts();
        other.FlushUnitCounts();
        if (other._cells is { } cells) Cells.Add(cells);
        for (var k = 0; k < _tails.Length; k++) _tails[k].Add(other._tails[k]);
    }

    /// <summary>The whole state as plain numbers.</summary>
    public FineGridState State()
    {
        FlushUnitCounts();
        return new(Cells.State(), _tails.Select(t => t.Terms).ToList());
    }

    /// <summary>Adds a state in the form <see cref="State"/> gives it; false when it does not fit this grid.</summary>
    public bool AddState(FineGridState state)
    {
        FlushUnitCounts();
        if (state.Tails.Count != _tails.Length || !Cells.AddState(state.Histogram)) return false;
        for (var k = 0; k < _tails.Length; k++) foreach (var v in state.Tails[k]) _tails[k].Add(v);
        return true;
    }

    /// <summary>The cells and tail moments, each exact sum rounded once.</summary>
    public FineGridCells Finish()
    {
        var tails = (_tails[0].Value, _tails[1].Value, _tails[2].Value, _tails[3].Value);
        if (_cells is null)
        {
            // Unit weights only: each cell's count is its exact Σw and Σw².
            var sums = new double[_unitCounts.Length];
            for (var c = 0; c < sums.Length; c++) sums[c] = _unitCounts[c];
            return new FineGridCells(_axis.Edges.ToArray(), sums, (double[])sums.Clone(), tails.Item1, tails.Item2, tails.Item3, tails.Item4);
        }
        FlushUnitCounts();
        var h = _cells.ToHistogram();
        return new FineGridCells(h.Axis.Edges.ToArray(), h.SumW.ToArray(), h.SumW2.ToArray(), tails.Item1, tails.Item2, tails.Item3, tails.Item4);
    }
}

/// <summary>A <see cref="FineGridCounter"/>'s state: its exact cells and the four tail sums as their exact terms.</summary>
internal sealed record FineGridState(ExactHistogramState Histogram, IReadOnlyList<IReadOnlyList<double>> Tails);
