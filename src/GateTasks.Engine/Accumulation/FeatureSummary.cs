namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Unbinned statistics of one feature in a sample, NaN and infinite values excluded (and counted): the numbers the checks need beyond
/// the histogram (the reference's standard deviation normalises Wasserstein-1, its quantiles place the core;
/// the kurtosis μ₄/σ⁴ sets the uncertainty of a width).
/// </summary>
internal sealed record FeatureSummary(
    long Count,
    double SumW,
    double SumW2,
    double Mean,
    double StandardDeviation,
    double Min,
    double Max,
    long NanCount,
    double Kurtosis = double.NaN)
{
    /// <summary>Values equal to +∞.</summary>
    public long PositiveInfinityCount { get; init; }

    /// <summary>Values equal to −∞.</summary>
    public long NegativeInfinityCount { get; init; }

    /// <summary>NaN and infinite values together.</summary>
    public long NonFiniteCount => NanCount + PositiveInfinityCount + NegativeInfinityCount;

    /// <summary>Kish (1965) effective number of events, (Σw)²/Σw².</summary>
    public double EffectiveCount => Statistics.KishCount.Of(SumW, SumW2);
}
