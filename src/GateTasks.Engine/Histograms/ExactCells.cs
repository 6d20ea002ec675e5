using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Histograms;

/// <summary>
/// Σw and Σw² of a fixed number of cells, each an <see cref="ExactSum"/>: fed one batch at a time from a plain
/// <see cref="WeightedStorage"/> (which is then cleared), merged and stored without losing a bit.
/// </summary>
internal sealed class ExactCells
{
    private readonly ExactSum[] _sumW;
    private readonly ExactSum[] _sumW2;

    public ExactCells(int count)
    {
        _sumW = Enumerable.Range(0, count).Select(_ => new ExactSum()).ToArray();
        _sumW2 = Enumerable.Range(0, count).Select(_ => new ExactSum()).ToArray();
    }

    private ExactCells(ExactSum[] sumW, ExactSum[] sumW2) => (_sumW, _sumW2) = (sumW, sumW2);

    public int Count => _sumW.Length;

    /// <summary>An independent copy, every cell's terms as they are.</summary>
    public ExactCells Copy() => new(_sumW.Select(s => s.Copy()).ToArray(), _sumW2.Select(s => s.Copy()).ToArray());

    /// <summary>Adds a batch's cells exactly and clears them for the next batch.</summary>
    public void Absorb(WeightedStorage batch)
    {
        var w = batch.SumW;
        var w2 = batch.SumW2;
        for (var c = 0; c < _sumW.Length; c++)
        {
            if (w[c] != 0) _sumW[c].Add(w[c]);
            if (w2[c] != 0) _sumW2[c].Add(w2[c]);
        }
        w.Clear();
        w2.Clear();
    }

    /// <summary>Adds other cells of the same count (exact, so in any order).</summary>
    public void Add(ExactCells other)
    {
        for (var c = 0; c < _sumW.Length; c++)
        {
            _sumW[c].Add(other._sumW[c]);
            _sumW2[c].Add(other._sumW2[c]);
        }
    }

    /// <summary>Each cell's Σw, rounded once from its exact sum.</summary>
    public double[] SumW() => _sumW.Select(s => s.Value).ToArray();

    /// <summary>Each cell's Σw², rounded once from its exact sum.</summary>
    public double[] SumW2() => _sumW2.Select(s => s.Value).ToArray();

    /// <summary>Every cell's exact sums as their terms.</summary>
    public ExactCellsState State() => new(_sumW.Select(c => c.Terms).ToList(), _sumW2.Select(c => c.Terms).ToList());

    /// <summary>Adds cells in the form <see cref="State"/> gives them; false when their count differs.</summary>
    public bool AddState(ExactCellsState state)
    {
        if (state.SumW.Count != _sumW.Length || state.SumW2.Count != _sumW2.Length) return false;
        for (var c = 0; c < _sumW.Length; c++)
        {
            foreach (var v in state.SumW[c]) _sumW[c].Add(v);
            foreach (var v in state.SumW2[c]) _sumW2[c].Add(v);
        }
        return true;
    }
}
