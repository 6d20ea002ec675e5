namespace GateTasks.Engine.Histograms;

/// <summary>
/// A one-dimensional weighted histogram: an <see cref="Axis"/> plus one <see cref="WeightedStorage"/>.
/// NaN values are counted apart from the bins, never in a flow cell.
/// </summary>
internal sealed class Histogram
{
    /// <summary>Creates an empty histogram over <paramref name="axis"/>.</summary>
    public Histogram(Axis axis)
    {
        Axis = axis;
        Storage = new WeightedStorage(axis.Count);
    }

    /// <summary>The binning.</summary>
    public Axis Axis { get; }

    /// <summary>Σw and Σw² per cell (underflow, bins, overflow).</summary>
    public WeightedStorage Storage { get; }

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
            foreach (var w in Storage.SumW) s += w;
            return s;
        }
    }

    /// <summary>Σw² over all cells (NaN excluded).</summary>
    public double TotalSumW2
    {
        get
        {
            double s = 0;
            foreach (var w in Storage.SumW2) s += w;
            return s;
        }
    }

    /// <summary>Storage cell for a regular bin index or a flow index of the axis.</summary>
    public static int Cell(int axisIndex) => axisIndex + 1;

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
        Storage.Add(Cell(Axis.Index(value)), weight);
    }

    /// <summary>Fills many values, each with weight one or with the matching weight.</summary>
    public void Fill(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        if (!weights.IsEmpty && weights.Length != values.Length)
            throw new ArgumentException("Values and weights differ in length.", nameof(weights));
        // The same sums as filling value by value: cells are found a block at a time, and unit weights are counted
        // and added once per cell (a sum of ones is exact, so Σw and Σw² come out identical).
        var nanCell = Storage.CellCount;
        Span<int> cells = stackalloc int[Math.Min(values.Length, FillBlock)];
        var sumW = Storage.SumW;
        var sumW2 = Storage.SumW2;
        if (weights.IsEmpty)
        {
            if (_counts is null || _counts.Length != nanCell + 1) _counts = new long[nanCell + 1];
            for (var start = 0; start < values.Length; start += FillBlock)
            {
                var block = values.Slice(start, Math.Min(FillBlock, values.Length - start));
                var blockCells = cells[..block.Length];
                Axis.Cells(block, blockCells, nanCell);
                foreach (var c in blockCells) _counts[c]++;
            }
            for (var c = 0; c < nanCell; c++)
            {
                if (_counts[c] == 0) continue;
                sumW[c] += _counts[c];
                sumW2[c] += _counts[c];
                _counts[c] = 0;
            }
            var nan = _counts[nanCell];
            _counts[nanCell] = 0;
            Entries += values.Length;
            NanEntries += nan;
            NanSumW += nan;
            NanSumW2 += nan;
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

    /// <summary>Values whose cells are found in one call.</summary>
    private const int FillBlock = 512;

    /// <summary>Per-cell counts of the unit-weight fill (the last slot counts NaN), kept between fills.</summary>
    private long[]? _counts;

    /// <summary>Adds another histogram with the same binning (exact; order-independent up to rounding).</summary>
    public void Add(Histogram other)
    {
        if (!Axis.SameBinning(other.Axis)) throw new ArgumentException("Histograms differ in binning.", nameof(other));
        Storage.Add(other.Storage);
        Entries += other.Entries;
        NanEntries += other.NanEntries;
        NanSumW += other.NanSumW;
        NanSumW2 += other.NanSumW2;
    }

    /// <summary>Empties every cell and count, keeping the binning (for reuse as a per-batch buffer).</summary>
    public void Clear()
    {
        Storage.SumW.Clear();
        Storage.SumW2.Clear();
        Entries = 0;
        NanEntries = 0;
        NanSumW = 0;
        NanSumW2 = 0;
    }

    /// <summary>Restores a histogram from stored cells (for reading reference files).</summary>
    public static Histogram FromCells(Axis axis, ReadOnlySpan<double> sumW, ReadOnlySpan<double> sumW2,
        long entries, long nanEntries, double nanSumW, double nanSumW2)
    {
        var h = new Histogram(axis);
        if (sumW.Length != h.Storage.CellCount || sumW2.Length != h.Storage.CellCount)
            throw new ArgumentException("Cell count does not match the axis.");
        sumW.CopyTo(h.Storage.SumW);
        sumW2.CopyTo(h.Storage.SumW2);
        h.Entries = entries;
        h.NanEntries = nanEntries;
        h.NanSumW = nanSumW;
        h.NanSumW2 = nanSumW2;
        return h;
    }

    /// <summary>The p-quantile of a histogram (linear within its bin) and the density there; flows sit at the axis ends.</summary>
    public (double Value, double Density) Quantile(double p)
    {
        var w = Storage.SumW;
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
}
