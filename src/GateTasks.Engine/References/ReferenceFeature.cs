using GateTasks.Engine.Contracts;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.References;

/// <summary>
/// One feature of a reference: the histogram the surrogate is compared with, the binning request it was built
/// from, the quantiles the core region needs, unbinned summary statistics, and (for a Wasserstein check) the
/// reference's weight on its fine equal-probability grid.
/// </summary>
internal sealed record ReferenceFeature(
    string Name,
    string Column,
    FeatureKind Kind,
    string BinningRequest,
    Histogram Histogram,
    FeatureSummary Summary,
    IReadOnlyList<QuantilePoint> Quantiles,
    SpikeTally? Spike = null,
    FarTailCounts? FarTail = null,
    FineGridCells? FineGrid = null)
{
    /// <summary>The value at probability <paramref name="p"/>, if the reference stored it.</summary>
    public double? Quantile(double p)
    {
        foreach (var q in Quantiles)
            if (Math.Abs(q.Probability - p) < 1e-12) return q.Value;
        return null;
    }

    /// <summary>The thresholds every far-tail count uses: the reference's 0.1% and 99.9% quantiles.</summary>
    public (double Low, double High)? FarTailThresholds =>
        Quantile(0.001) is { } lo && Quantile(0.999) is { } hi ? (lo, hi) : null;

    /// <summary>What a sample's accumulation takes from this feature of the reference.</summary>
    public FeatureLayout Layout => new(Histogram, FarTail is { } t ? (t.Low, t.High) : null, FineGrid?.Edges);
}

/// <summary>A stored quantile: P(X &lt; value) ≈ probability.</summary>
internal readonly record struct QuantilePoint(double Probability, double Value);
