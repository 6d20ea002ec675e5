namespace GateTasks.Engine.Statistics;

/// <summary>
/// The Kolmogorov (1933) limiting distribution of √(mn/(m+n))·D for the two-sample Kolmogorov–Smirnov
/// distance D (Smirnov 1939); the binned distance and its p-value are in KolmogorovSmirnov.Binned.cs.
/// </summary>
internal static partial class KolmogorovSmirnov
{
    /// <summary>Kolmogorov limiting survival function Q(λ) = P(K &gt; λ).</summary>
    internal static double LimitSurvival(double lambda)
    {
        if (double.IsNaN(lambda))
            throw new ArgumentException("λ is NaN.", nameof(lambda));
        if (lambda <= 0)
            return 1.0;
        if (lambda < SeriesSwitch)
            return 1.0 - SmallLambdaCdf(lambda);
        return LargeLambdaSurvival(lambda);
    }

    internal static double Lambda(double d, double m, double n) => Math.Sqrt(m * n / (m + n)) * d;

    // Both series need only a handful of terms at λ = 1; below it the alternating series converges slowly
    // and 1 − Q loses the CDF's relative precision, above it the theta-function series does the same for Q.
    private const double SeriesSwitch = 1.0;

    /// <summary>Q(λ) = 2 Σ_{k≥1} (−1)^{k−1} exp(−2k²λ²) (Kolmogorov 1933).</summary>
    private static double LargeLambdaSurvival(double lambda)
    {
        double sum = 0, sign = 1;
        double a = -2.0 * lambda * lambda;
        for (int k = 1; k <= 100; k++)
        {
            double term = Math.Exp(a * k * k);
            sum += sign * term;
            if (term <= 1e-18 * sum)
                break;
            sign = -sign;
        }
        return Math.Clamp(2.0 * sum, 0.0, 1.0);
    }

    /// <summary>P(K ≤ λ) = (√(2π)/λ) Σ_{k≥1} exp(−(2k−1)²π²/(8λ²)), the Jacobi-transformed series.</summary>
    private static double SmallLambdaCdf(double lambda)
    {
        double sum = 0;
        double a = -Math.PI * Math.PI / (8.0 * lambda * lambda);
        for (int k = 1; k <= 100; k++)
        {
            double odd = 2 * k - 1;
            double term = Math.Exp(a * odd * odd);
            sum += term;
            if (term <= 1e-18 * sum || term == 0)
                break;
        }
        return Math.Clamp(Math.Sqrt(2.0 * Math.PI) / lambda * sum, 0.0, 1.0);
    }
}
