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
    private readonly Histogram _batch;
    private readonly ExactHistogram _cells;
    // Below: Σw·d, Σw²·d²; above: Σw·d, Σw²·d² — summed per batch, then exactly.
    private readonly ExactSum[] _tails = Enumerable.Range(0, 4).Select(_ => new ExactSum()).ToArray();

    public FineGridCounter(IReadOnlyList<double> edges)
    {
        var axis = Axis.FromEdges(edges);
        _batch = new Histogram(axis);
        _cells = new ExactHistogram(axis);
    }

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

    private void AddFinite(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        _batch.Fill(values, weights);
        _cells.Absorb(_batch);
        var edges = _cells.Axis.Edges;
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
        double[] batch = [belowW, belowW2, aboveW, aboveW2];
        for (var k = 0; k < batch.Length; k++)
            if (batch[k] != 0) _tails[k].Add(batch[k]);
    }

    /// <summary>Adds another counter's sums (same grid; exact).</summary>
    public void Merge(FineGridCounter other)
    {
        _cells.Add(other._cells);
        for (var k = 0; k < _tails.Length; k++) _tails[k].Add(other._tails[k]);
    }

    /// <summary>The whole state as plain numbers.</summary>
    public FineGridState State() => new(_cells.State(), _tails.Select(t => t.Terms).ToList());

    /// <summary>Adds a state in the form <see cref="State"/> gives it; false when it does not fit this grid.</summary>
    public bool AddState(FineGridState state)
    {
        if (state.Tails.Count != _tails.Length || !_cells.AddState(state.Histogram)) return false;
        for (var k = 0; k < _tails.Length; k++) foreach (var v in state.Tails[k]) _tails[k].Add(v);
        return true;
    }

    /// <summary>The cells and tail moments, each exact sum rounded once.</summary>
    public FineGridCells Finish()
    {
        var h = _cells.ToHistogram();
        return new FineGridCells(h.Axis.Edges.ToArray(), h.SumW.ToArray(), h.SumW2.ToArray(),
            _tails[0].Value, _tails[1].Value, _tails[2].Value, _tails[3].Value);
    }
}

/// <summary>A <see cref="FineGridCounter"/>'s state: its exact cells and the four tail sums as their exact terms.</summary>
internal sealed record FineGridState(ExactHistogramState Histogram, IReadOnlyList<IReadOnlyList<double>> Tails);
