namespace GateTasks.Engine.Histograms;

/// <summary>
/// A one-dimensional weighted histogram: an <see cref="Axis"/> plus Σw and Σw² per cell. NaN values are counted apart
/// from the bins, never in a flow cell. How the cells are stored is the histogram's own business: callers ask for the
/// regular bins, the underflow, the overflow or NaN by name, or for every cell in value order.
/// </summary>
internal sealed class Histogram
{
    /// <summary>Creates an empty histogram over <paramref name="axis"/>.</summary>
    public Histogram(Axis axis)
    {
        Axis = axis;
        _storage = new WeightedStorage(axis.Count);
    }

    // Cell 0 the underflow, cells 1..Count the regular bins, cell Count + 1 the overflow (see Axis.Cells).
    private readonly WeightedStorage _storage;

    /// <summary>The binning.</summary>
    public Axis Axis { get; }

    /// <summary>Σw of every cell in value order: the underflow, the regular bins, the overflow (NaN apart).</summary>
    public ReadOnlySpan<double> SumW => _storage.SumW;

    /// <summary>Σw² of every cell in value order: the underflow, the regular bins, the overflow (NaN apart).</summary>
    public ReadOnlySpan<double> SumW2 => _storage.SumW2;

    /// <summary>Σw of regular bin <paramref name="bin"/>.</summary>
    public double BinSumW(int bin) => _storage.SumW[bin + 1];

    /// <summary>Σw² of regular bin <paramref name="bin"/>.</summary>
    public double BinSumW2(int bin) => _storage.SumW2[bin + 1];

    /// <summary>Σw below the first edge.</summary>
    public double UnderflowSumW => _storage.SumW[0];

    /// <summary>Σw at or above the last edge.</summary>
    public double OverflowSumW => _storage.SumW[^1];

    /// <summary>Number of fills, NaN included.</summary>
    public long Entries { get; private set; }

    /// <summary>Number of NaN values seen.</summary>
    public long NanEntries { get; private set; }

    /// <summary>Σw of NaN values.</summary>
    public double NanSumW { get; private set; }

    /// <summary>Σw² of NaN values.</summary>
    public double NanSumW2 { get; private set; }

    /// <summary>Σw over all cells (NaN excluded).</summary>
    public double TotalSumW
    {
        get
        {
            double s = 0;
            foreach (var w in _storage.SumW) s += w;
            return s;
        }
    }

    /// <summary>Σw² over all cells (NaN excluded).</summary>
    public double TotalSumW2
    {
        get
        {
            double s = 0;
            foreach (var w in _storage.SumW2) s += w;
            return s;
        }
    }

    /// <summary>
    /// The normalised cumulative distribution at <paramref name="x"/>, linear within a bin, the underflow counted below
    /// the axis (see <see cref="CellCdf"/>); NaN when the histogram holds no weight.
    /// </summary>
    public double Cdf(double x)
    {
        var total = TotalSumW;
        if (!(total > 0)) return double.NaN;
        return CellCdf.At(Axis.Edges, _storage.SumW, x) / total;
    }

    /// <summary>
    /// The p-quantile (linear within its bin) and the normalised density there; the flows sit at the axis ends, so a
    /// quantile that falls in one is the end's edge, with density 0.
    /// </summary>
    public (double Value, double Density) Quantile(double p)
    {
        ReadOnlySpan<double> w = _storage.SumW;
        var total = TotalSumW;
        var target = p * total;
        var cumulative = w[0];
        var edges = Axis.Edges;
        if (cumulative >= target) return (edges[0], 0);
        for (var b = 0; b < Axis.Count; b++)
        {
            var content = w[b + 1];
            if (cumulative + content >= target && content > 0)
            {
                var width = edges[b + 1] - edges[b];
                return (edges[b] + (target - cumulative) / content * width, content / total / width);
            }
            cumulative += content;
        }
        return (edges[^1], 0);
    }

    /// <summary>
    /// Sums the cells into a histogram over <paramref name="coarse"/>, whose edges must all be edges of this axis; the
    /// flows stay flows and NaN stays NaN. <paramref name="entries"/> is the new histogram's fill count.
    /// </summary>
    public Histogram Rebinned(Axis coarse, long entries)
    {
        var sumW = new double[coarse.Count + 2];
        var sumW2 = new double[coarse.Count + 2];
        var edges = Axis.Edges;
        var last = _storage.CellCount - 1;
        for (var c = 0; c <= last; c++)
        {
            var target = c == 0 ? 0 : c == last ? coarse.Count + 1 : coarse.Index(edges[c - 1]) + 1;
            sumW[target] += _storage.SumW[c];
            sumW2[target] += _storage.SumW2[c];
        }
        return FromCells(coarse, sumW, sumW2, entries, NanEntries, NanSumW, NanSumW2);
    }

    /// <summary>Fills one value with a weight.</summary>
    public void Fill(double value, double weight = 1.0)
    {
        Entries++;
        if (double.IsNaN(value))
        {
            NanEntries++;
            NanSumW += weight;
            NanSumW2 += weight * weight;
            return;
        }
        _storage.Add(Axis.Index(value) + 1, weight);
    }

    /// <summary>Fills many values, each with weight one or with the matching weight.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Fill(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        if (!weights.IsEmpty && weights.Length != values.Length)
            throw new ArgumentException("Values and weights differ in length.", nameof(weights));
        // The same sums as filling value by value: cells are found a block at a time, and unit weights are counted
        // and added once per cell (a sum of ones is exact, so Σw and Σw² come out identical).
        var nanCell = _storage.CellCount;
        Span<int> cells = stackalloc int[Math.Min(values.Length, FillBlock)];
        var sumW = _storage.SumW;
        var sumW2 = _storage.SumW2;
        if (weights.IsEmpty)
        {
            var counts = Counts();
            for (var start = 0; start < values.Length; start += FillBlock)
            {
                var block = values.Slice(start, Math.Min(FillBlock, values.Length - start));
                var blockCells = cells[..block.Length];
                Axis.Cells(block, blockCells, nanCell);
                foreach (var c in blockCells) counts[c]++;
            }
            AddCounts(values.Length);
            return;
        }
        for (var start = 0; start < values.Length; start += FillBlock)
        {
            var length = Math.Min(FillBlock, values.Length - start);
            var blockCells = cells[..length];
            Axis.Cells(values.Slice(start, length), blockCells, nanCell);
            var blockWeights = weights.Slice(start, length);
            for (var i = 0; i < length; i++)
            {
                var w = blockWeights[i];
                var c = blockCells[i];
                if (c == nanCell)
                {
                    NanEntries++;
                    NanSumW += w;
                    NanSumW2 += w * w;
                    continue;
                }
                sumW[c] += w;
                sumW2[c] += w * w;
            }
        }
        Entries += values.Length;
    }

    /// <summary>
    /// Fills float32 values, each with weight one: the same cells and sums as filling them as doubles, with the cells
    /// found among float edges (twice the values per SIMD register) and no conversion.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public void Fill(ReadOnlySpan<float> values)
    {
        var nanCell = _storage.CellCount;
        Span<int> cells = stackalloc int[Math.Min(values.Length, FillBlock)];
        var counts = Counts();
        for (var start = 0; start < values.Length; start += FillBlock)
        {
            var block = values.Slice(start, Math.Min(FillBlock, values.Length - start));
            var blockCells = cells[..block.Length];
            Axis.Cells(block, blockCells, nanCell);
            foreach (var c in blockCells) counts[c]++;
        }
        AddCounts(values.Length);
    }

    /// <summary>
    /// Adds <paramref name="values"/> values of weight one, none of them NaN, given as a count per storage cell: the
    /// sums <see cref="Fill(ReadOnlySpan{float})"/> gives them (a sum of ones is exact). Zeroes the counts.
    /// </summary>
    public void AddUnitCounts(Span<long> counts, int values)
    {
        if (counts.Length != _storage.CellCount) throw new ArgumentException("Cell count does not match the axis.", nameof(counts));
        var sumW = _storage.SumW;
        var sumW2 = _storage.SumW2;
        for (var c = 0; c < counts.Length; c++)
        {
            if (counts[c] == 0) continue;
            sumW[c] += counts[c];
            sumW2[c] += counts[c];
            counts[c] = 0;
        }
        Entries += values;
    }

    // The unit-weight counts, zero between fills; the last slot counts NaN.
    private long[] Counts()
    {
        var cells = _storage.CellCount + 1;
        if (_counts is null || _counts.Length != cells) _counts = new long[cells];
        return _counts;
    }

    // Adds the counts of a unit-weight fill of so many values to the cells (a sum of ones is exact, so Σw and Σw² come
    // out as filling value by value gives them) and zeroes them.
    private void AddCounts(int values)
    {
        var counts = _counts!;
        var nanCell = _storage.CellCount;
        var sumW = _storage.SumW;
        var sumW2 = _storage.SumW2;
        for (var c = 0; c < nanCell; c++)
        {
            if (counts[c] == 0) continue;
            sumW[c] += counts[c];
            sumW2[c] += counts[c];
            counts[c] = 0;
        }
        var nan = counts[nanCell];
        counts[nanCell] = 0;
        Entries += values;
        NanEntries += nan;
        NanSumW += nan;
        NanSumW2 += nan;
    }

    /// <summary>Values whose cells are found in one call.</summary>
    private const int FillBlock = 512;

    /// <summary>Per-cell counts of the unit-weight fill (the last slot counts NaN), kept between fills.</summary>
    private long[]? _counts;

    /// <summary>Adds another histogram with the same binning (exact; order-independent up to rounding).</summary>
    public void Add(Histogram other)
    {
        if (!Axis.SameBinning(other.Axis)) throw new ArgumentException("Histograms differ in binning.", nameof(other));
        _storage.Add(other._storage);
        Entries += other.Entries;
        NanEntries += other.NanEntries;
        NanSumW += other.NanSumW;
        NanSumW2 += other.NanSumW2;
    }

    /// <summary>Empties every cell and count, keeping the binning (for reuse as a per-batch buffer).</summary>
    public void Clear()
    {
        _storage.SumW.Clear();
        _storage.SumW2.Clear();
        Entries = 0;
        NanEntries = 0;
        NanSumW = 0;
        NanSumW2 = 0;
    }

    /// <summary>
    /// Adds this histogram's cells exactly into <paramref name="cells"/> and clears them (not the counts; see
    /// <see cref="Clear"/>).
    /// </summary>
    public void MoveCellsInto(ExactCells cells) => cells.Absorb(_storage);

    /// <summary>Restores a histogram from its cells in value order, as <see cref="SumW"/> gives them (for reading stored state).</summary>
    public static Histogram FromCells(Axis axis, ReadOnlySpan<double> sumW, ReadOnlySpan<double> sumW2,
        long entries, long nanEntries, double nanSumW, double nanSumW2)
    {
        var h = new Histogram(axis);
        if (sumW.Length != h._storage.CellCount || sumW2.Length != h._storage.CellCount)
            throw new ArgumentException("Cell count does not match the axis.");
        sumW.CopyTo(h._storage.SumW);
        sumW2.CopyTo(h._storage.SumW2);
        h.Entries = entries;
        h.NanEntries = nanEntries;
        h.NanSumW = nanSumW;
        h.NanSumW2 = nanSumW2;
        return h;
    }
}
