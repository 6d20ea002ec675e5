using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Accumulates, in one streamed pass, Pearson's r of a declared pair and Spearman's ρ as the Pearson correlation of
/// the values' ranks under the reference's marginal CDFs (equal to the sample's own ranks when its marginals match
/// the reference's). Pairs where either value is NaN are skipped.
/// </summary>
internal sealed class PairCorrelation(CorrelationSpec spec, int first, int second, MarginalCdf firstCdf, MarginalCdf secondCdf,
    Histogram2D? joint = null)
{
    /// <summary>The pair's 2-D histogram, when its χ² test is asked for: a per-batch buffer, added exactly into the cells below.</summary>
    public Histogram2D? Joint { get; } = joint;

    private readonly ExactCells? _cells = joint is null ? null : new ExactCells(joint.CellCount);

    /// <summary>The 2-D cells' Σw and Σw², each summed exactly and rounded once; null without a χ² test.</summary>
    public (double[] SumW, double[] SumW2)? JointCells => _cells is null ? null : (_cells.SumW(), _cells.SumW2());

    private readonly WeightedCorrelation _pearson = new();
    private readonly WeightedCorrelation _spearman = new();

    public CorrelationSpec Spec { get; } = spec;

    public void Add(Samples.FeatureView view)
    {
        var x = view.Feature(first);
        var y = view.Feature(second);
        var weights = view.Weights;
        for (var r = 0; r < x.Length; r++)
        {
            if (double.IsNaN(x[r]) || double.IsNaN(y[r])) continue;
            var w = weights.IsEmpty ? 1.0 : weights[r];
            _pearson.Add(x[r], y[r], w);
            _spearman.Add(firstCdf.Evaluate(x[r]), secondCdf.Evaluate(y[r]), w);
            Joint?.Fill(x[r], y[r], w);
        }
        if (Joint is not null) Joint.MoveCellsInto(_cells!);
    }

    /// <summary>Writes the pair's state into a partial file.</summary>
    public void WriteState(System.Text.Json.Utf8JsonWriter w)
    {
        w.WriteStartObject();
        w.WriteString("pair", Spec.Name);
        Partials.PartialNumbers.WriteArray(w, "pearson", _pearson.State());
        Partials.PartialNumbers.WriteArray(w, "spearman", _spearman.State());
        _cells?.WriteState(w, "cells_w", "cells_w2");
        w.WriteEndObject();
    }

    /// <summary>Reads a state written by <see cref="WriteState"/> (into a fresh accumulation); false when it does not fit.</summary>
    public bool ReadState(System.Text.Json.JsonElement e)
    {
        if (e.GetProperty("pair").GetString() != Spec.Name) return false;
        _pearson.Restore(Partials.PartialNumbers.ReadArray(e.GetProperty("pearson")));
        _spearman.Restore(Partials.PartialNumbers.ReadArray(e.GetProperty("spearman")));
        if (_cells is null) return !e.TryGetProperty("cells_w", out _);
        return e.TryGetProperty("cells_w", out _) && _cells.ReadState(e, "cells_w", "cells_w2");
    }

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
