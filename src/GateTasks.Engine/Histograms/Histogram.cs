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
        for (var i = 0; i < values.Length; i++) Fill(values[i], weights.IsEmpty ? 1.0 : weights[i]);
    }

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
}
