using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Histograms;

/// <summary>
/// A histogram's cells summed exactly: each cell's Σw and Σw² is an <see cref="ExactSum"/>, fed one batch at a time
/// from an ordinary <see cref="Histogram"/> that is then cleared. Because the sums are exact, the cells do not depend
/// on how the batches were grouped — one pass over a sample and the merge of its shards give the same bits.
/// </summary>
internal sealed class ExactHistogram
{
    private readonly ExactSum[] _sumW;
    private readonly ExactSum[] _sumW2;
    private readonly ExactSum _nanW = new();
    private readonly ExactSum _nanW2 = new();

    public ExactHistogram(Axis axis)
    {
        Axis = axis;
        var cells = axis.Count + 2;
        _sumW = Enumerable.Range(0, cells).Select(_ => new ExactSum()).ToArray();
        _sumW2 = Enumerable.Range(0, cells).Select(_ => new ExactSum()).ToArray();
    }

    public Axis Axis { get; }
    public long Entries { get; private set; }
    public long NanEntries { get; private set; }

    /// <summary>Adds a batch's histogram (same binning) exactly and clears it for the next batch.</summary>
    public void Absorb(Histogram batch)
    {
        var w = batch.Storage.SumW;
        var w2 = batch.Storage.SumW2;
        for (var c = 0; c < _sumW.Length; c++)
        {
            if (w[c] != 0) _sumW[c].Add(w[c]);
            if (w2[c] != 0) _sumW2[c].Add(w2[c]);
        }
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
        for (var c = 0; c < _sumW.Length; c++)
        {
            _sumW[c].Add(other._sumW[c]);
            _sumW2[c].Add(other._sumW2[c]);
        }
        _nanW.Add(other._nanW);
        _nanW2.Add(other._nanW2);
        Entries += other.Entries;
        NanEntries += other.NanEntries;
    }

    /// <summary>Writes the exact state (every cell's partial sums) into a partial file.</summary>
    public void WriteState(System.Text.Json.Utf8JsonWriter w)
    {
        w.WriteStartObject();
        w.WriteNumber("entries", Entries);
        w.WriteNumber("nan_entries", NanEntries);
        Partials.PartialNumbers.WriteJagged(w, "sum_w", _sumW.Select(c => c.Partials));
        Partials.PartialNumbers.WriteJagged(w, "sum_w2", _sumW2.Select(c => c.Partials));
        Partials.PartialNumbers.WriteArray(w, "nan_w", _nanW.Partials);
        Partials.PartialNumbers.WriteArray(w, "nan_w2", _nanW2.Partials);
        w.WriteEndObject();
    }

    /// <summary>Reads a state written by <see cref="WriteState"/> for this axis; false when the cell count differs.</summary>
    public bool ReadState(System.Text.Json.JsonElement e)
    {
        var w = Partials.PartialNumbers.ReadJagged(e.GetProperty("sum_w"));
        var w2 = Partials.PartialNumbers.ReadJagged(e.GetProperty("sum_w2"));
        if (w.Length != _sumW.Length || w2.Length != _sumW2.Length) return false;
        for (var c = 0; c < w.Length; c++)
        {
            foreach (var v in w[c]) _sumW[c].Add(v);
            foreach (var v in w2[c]) _sumW2[c].Add(v);
        }
        foreach (var v in Partials.PartialNumbers.ReadArray(e.GetProperty("nan_w"))) _nanW.Add(v);
        foreach (var v in Partials.PartialNumbers.ReadArray(e.GetProperty("nan_w2"))) _nanW2.Add(v);
        Entries += e.GetProperty("entries").GetInt64();
        NanEntries += e.GetProperty("nan_entries").GetInt64();
        return true;
    }

    /// <summary>The cells, each exact sum rounded once to a double.</summary>
    public Histogram ToHistogram() => Histogram.FromCells(Axis, _sumW.Select(s => s.Value).ToArray(), _sumW2.Select(s => s.Value).ToArray(),
        Entries, NanEntries, _nanW.Value, _nanW2.Value);
}
