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
    /// <summary>The pair's 2-D histogram, when its χ² test is asked for.</summary>
    public Histogram2D? Joint { get; } = joint;

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
    }

    public double Pearson => _pearson.Pearson;
    public double Spearman => _spearman.Pearson;
    public double EffectiveCount => _pearson.EffectiveCount;
}
