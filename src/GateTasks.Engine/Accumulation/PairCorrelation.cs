using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Accumulates, in one streamed pass, Pearson's r of a declared pair and Spearman's ρ as the Pearson correlation of
/// the values' ranks under the reference's marginal CDFs (equal to the sample's own ranks when its marginals match
/// the reference's). Pairs where either value is NaN are skipped.
/// </summary>
internal sealed class PairCorrelation(CorrelationSpec spec, int first, int second, MarginalCdf firstCdf, MarginalCdf secondCdf,
    Histogram2D? joint = null)
{
    /// <summary>
    /// The pair's 2-D histogram on its <see cref="PairGrid"/> (the features' axes for a χ² test, else the coarse map
    /// grid): a per-batch buffer, added exactly into the cells below. Null only where a caller gathers no cells.
    /// </summary>
    public Histogram2D? Joint { get; } = joint;

    private readonly ExactCells? _cells = joint is null ? null : new ExactCells(joint.CellCount);

    private readonly WeightedCorrelation _pearson = new();
    private readonly WeightedCorrelation _spearman = new();

    public CorrelationSpec Spec { get; } = spec;

    // Per-batch buffers of the pairs without NaN: values, their reference-CDF ranks, weights.
    private double[] _x = [], _y = [], _u = [], _v = [], _w = [];

    public void Add(Samples.FeatureView view)
    {
        var x = view.Feature(first);
        var y = view.Feature(second);
        var weights = view.Weights;
        if (_x.Length < x.Length) (_x, _y, _u, _v, _w) = (new double[x.Length], new double[x.Length], new double[x.Length], new double[x.Length], new double[x.Length]);
        var kept = 0;
        for (var r = 0; r < x.Length; r++)
        {
            if (double.IsNaN(x[r]) || double.IsNaN(y[r])) continue;
            var w = weights.IsEmpty ? 1.0 : weights[r];
            (_x[kept], _y[kept], _u[kept], _v[kept], _w[kept]) = (x[r], y[r], firstCdf.Evaluate(x[r]), secondCdf.Evaluate(y[r]), w);
            kept++;
        }
        var ws = weights.IsEmpty ? ReadOnlySpan<double>.Empty : _w.AsSpan(0, kept);
        Joint?.Fill(_x.AsSpan(0, kept), _y.AsSpan(0, kept), ws);
        _pearson.AddBatch(_x.AsSpan(0, kept), _y.AsSpan(0, kept), ws);
        _spearman.AddBatch(_u.AsSpan(0, kept), _v.AsSpan(0, kept), ws);
        if (Joint is not null) Joint.MoveCellsInto(_cells!);
    }

    /// <summary>The pair's state as plain numbers.</summary>
    public PairState State() => new(Spec.Name, _pearson.State(), _spearman.State(), _cells?.State());

    /// <summary>Sets a state in the form <see cref="State"/> gives it (into a fresh accumulation); false when it does not fit.</summary>
    public bool SetState(PairState state)
    {
        if (state.Name != Spec.Name) return false;
        if (!_pearson.Restore(state.Pearson.ToArray()) || !_spearman.Restore(state.Spearman.ToArray())) return false;
        if (_cells is null) return state.Cells is null;
        return state.Cells is { } cells && _cells.AddState(cells);
    }

    /// <summary>The pair, finished.</summary>
    public AccumulatedPair Finish() => new(Spec, Pearson, Spearman, EffectiveCount,
        _pearson.AsymptoticVariance, _spearman.AsymptoticVariance, _cells is null ? null : new CellSums(_cells.SumW(), _cells.SumW2()));

    /// <summary>Adds another accumulation of the same pair (coefficients to rounding, 2-D cells exactly).</summary>
    public void Merge(PairCorrelation other)
    {
        _pearson.Merge(other._pearson);
        _spearman.Merge(other._spearman);
        if (_cells is not null && other._cells is not null) _cells.Add(other._cells);
    }

    public double Pearson => _pearson.Pearson;
    public double Spearman => _spearman.Pearson;
    public double EffectiveCount => _pearson.EffectiveCount;
}
