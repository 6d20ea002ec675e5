using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Two-sided confidence interval for a binomial proportion k/n: the exact Clopper &amp; Pearson (1934) interval.
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
