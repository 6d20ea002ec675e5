using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Two-sided confidence intervals for a binomial proportion k/n: the exact Clopper &amp; Pearson (1934)
/// interval and the Wilson (1927) score interval without continuity correction.
/// </summary>
internal static class BinomialInterval
{
    /// <summary>
    /// Clopper &amp; Pearson (1934) exact interval from Beta quantiles: lower = B⁻¹(α/2; k, n − k + 1),
    /// upper = B⁻¹(1 − α/2; k + 1, n − k), with lower = 0 at k = 0 and upper = 1 at k = n.
    /// </summary>
    internal static (double Lower, double Upper) ClopperPearson(long k, long n, double confidence)
    {
        RequireCounts(k, n);
        double alpha = 1 - RequireConfidence(confidence);
        double lower = k == 0 ? 0.0 : Beta.InvCDF(k, n - k + 1, alpha / 2);
        double upper = k == n ? 1.0 : Beta.InvCDF(k + 1, n - k, 1 - alpha / 2);
        return (lower, upper);
    }

    /// <summary>
    /// Wilson (1927) score interval, no continuity correction:
    /// (p̂ + z²/2n ± z √(p̂(1 − p̂)/n + z²/4n²)) / (1 + z²/n), z the two-sided normal quantile.
    /// </summary>
    internal static (double Lower, double Upper) Wilson(long k, long n, double confidence)
    {
        RequireCounts(k, n);
        RequireConfidence(confidence);
        (double lower, double upper) = WilsonScore((double)k / n, n, confidence);
        // The formula gives 0 and 1 at the ends only up to rounding; report them exactly.
        return (k == 0 ? 0.0 : lower, k == n ? 1.0 : upper);
    }

    /// <summary>
    /// Wilson interval for a weighted fraction, with n replaced by the Kish (1965) effective count
    /// (Σw)²/Σw². An approximation: it treats the weighted sample as nEff unweighted trials, which is right
    /// for equal weights and only roughly right when weights vary within and between the two outcomes.
    /// </summary>
    internal static (double Lower, double Upper) WilsonEffective(double fraction, double nEff, double confidence)
    {
        if (!(fraction >= 0 && fraction <= 1))
            throw new ArgumentOutOfRangeException(nameof(fraction), fraction, "A fraction must lie in [0, 1].");
        if (!(nEff > 0) || double.IsPositiveInfinity(nEff))
            throw new ArgumentOutOfRangeException(nameof(nEff), nEff, "The effective count must be positive and finite.");
        RequireConfidence(confidence);
        (double lower, double upper) = WilsonScore(fraction, nEff, confidence);
        return (fraction == 0 ? 0.0 : lower, fraction == 1 ? 1.0 : upper);
    }

    private static (double Lower, double Upper) WilsonScore(double p, double n, double confidence)
    {
        double z = Normal.InvCDF(0, 1, 1 - (1 - confidence) / 2);
        double z2n = z * z / n;
        double centre = (p + z2n / 2) / (1 + z2n);
        double half = z * Math.Sqrt(p * (1 - p) / n + z2n / (4 * n)) / (1 + z2n);
        return (Math.Max(0.0, centre - half), Math.Min(1.0, centre + half));
    }

    private static void RequireCounts(long k, long n)
    {
        if (n < 1)
            throw new ArgumentOutOfRangeException(nameof(n), n, "A binomial interval needs at least one trial.");
        if (k < 0 || k > n)
            throw new ArgumentOutOfRangeException(nameof(k), k, $"The number of successes must lie in [0, {n}].");
    }

    private static double RequireConfidence(double confidence)
    {
        if (!(confidence > 0 && confidence < 1))
            throw new ArgumentOutOfRangeException(nameof(confidence), confidence, "The confidence level must lie in (0, 1).");
        return confidence;
    }
}
