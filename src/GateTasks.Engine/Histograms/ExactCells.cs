using System.Text.Json;
using GateTasks.Engine.Partials;
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

    public int Count => _sumW.Length;

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

    /// <summary>Writes every cell's partial sums under the two property names.</summary>
    public void WriteState(Utf8JsonWriter w, string sumWName, string sumW2Name)
    {
        PartialNumbers.WriteJagged(w, sumWName, _sumW.Select(c => c.Partials));
        PartialNumbers.WriteJagged(w, sumW2Name, _sumW2.Select(c => c.Partials));
    }

    /// <summary>Adds cells written by <see cref="WriteState"/>; false when their count differs.</summary>
    public bool ReadState(JsonElement e, string sumWName, string sumW2Name)
    {
        var w = PartialNumbers.ReadJagged(e.GetProperty(sumWName));
        var w2 = PartialNumbers.ReadJagged(e.GetProperty(sumW2Name));
        if (w.Length != _sumW.Length || w2.Length != _sumW2.Length) return false;
        for (var c = 0; c < w.Length; c++)
        {
            foreach (var v in w[c]) _sumW[c].Add(v);
            foreach (var v in w2[c]) _sumW2[c].Add(v);
        }
        return true;
    }
}
