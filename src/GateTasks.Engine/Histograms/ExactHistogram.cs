using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Histograms;

/// <summary>
/// A histogram's cells summed exactly: each cell's Σw and Σw² is an <see cref="ExactSum"/>, fed one batch at a time
/// from an ordinary <see cref="Histogram"/> that is then cleared. Because the sums are exact, the cells do not depend
/// on how the batches were grouped — one pass over a sample and the merge of its shards give the same bits.
/// </summary>
internal sealed class ExactHistogram
{
    private readonly ExactCells _cells;
    private readonly ExactSum _nanW;
    private readonly ExactSum _nanW2;

    public ExactHistogram(Axis axis) : this(axis, new ExactCells(axis.Count + 2), new ExactSum(), new ExactSum())
    {
    }

    private ExactHistogram(Axis axis, ExactCells cells, ExactSum nanW, ExactSum nanW2) => (Axis, _cells, _nanW, _nanW2) = (axis, cells, nanW, nanW2);

    /// <summary>
    /// An independent copy on <paramref name="axis"/> (the same binning): the same state to the bit, for a feature
    /// that was given the same values.
    /// </summary>
    public ExactHistogram CopyOn(Axis axis)
    {
        if (axis.GetType() != Axis.GetType() || !Axis.SameBinning(axis)) throw new ArgumentException("Histograms differ in binning.", nameof(axis));
        return new ExactHistogram(axis, _cells.Copy(), _nanW.Copy(), _nanW2.Copy()) { Entries = Entries, NanEntries = NanEntries };
    }

    public Axis Axis { get; }
    public long Entries { get; private set; }
    public long NanEntries { get; private set; }

    /// <summary>Adds a batch's histogram (same binning) exactly and clears it for the next batch.</summary>
    public void Absorb(Histogram batch)
    {
        batch.MoveCellsInto(_cells);
        if (batch.NanEntries > 0)
        {
            _nanW.Add(batch.NanSumW);
            _nanW2.Add(batch.NanSumW2);
        }
        Entries += batch.Entries;
        NanEntries += batch.NanEntries;
        batch.Clear();
    }

    /// <summary>Adds another exact histogram with the same binning (exact, so in any order).</summary>
    public void Add(ExactHistogram other)
    {
        if (!Axis.SameBinning(other.Axis)) throw new ArgumentException("Histograms differ in binning.", nameof(other));
        _cells.Add(other._cells);
        _nanW.Add(other._nanW);
        _nanW2.Add(other._nanW2);
        Entries += other.Entries;
        NanEntries += other.NanEntries;
    }

    /// <summary>The whole exact state as plain numbers.</summary>
    public ExactHistogramState State() => new(Entries, NanEntries, _cells.State(), _nanW.Terms, _nanW2.Terms);

    /// <summary>Adds a state in the form <see cref="State"/> gives it (for this axis); false when the cell count differs.</summary>
    public bool AddState(ExactHistogramState state)
    {
        if (!_cells.AddState(state.Cells)) return false;
        foreach (var v in state.NanW) _nanW.Add(v);
        foreach (var v in state.NanW2) _nanW2.Add(v);
        Entries += state.Entries;
        NanEntries += state.NanEntries;
        return true;
    }

    /// <summary>The cells, each exact sum rounded once to a double.</summary>
    public Histogram ToHistogram() => Histogram.FromCells(Axis, _cells.SumW(), _cells.SumW2(),
        Entries, NanEntries, _nanW.Value, _nanW2.Value);
}
