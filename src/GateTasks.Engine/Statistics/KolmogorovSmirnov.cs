namespace GateTasks.Engine.Statistics;

/// <summary>
/// Two-sample Kolmogorov–Smirnov test (Smirnov 1939). D = sup |F_m − G_n|, evaluated after each distinct
/// pooled value so ties are handled. Exact p-value by lattice-path counting (Hodges 1958) for small m·n,
/// otherwise the Kolmogorov (1933) limiting distribution at λ = √(mn/(m+n))·D.
/// </summary>
internal static partial class KolmogorovSmirnov
{
    /// <summary>Largest m·n for which <see cref="TwoSample"/> computes the exact p-value (O(m·n) work).</summary>
    internal const long ExactMaxProduct = 10_000;

    internal const string ExactMethod = "exact";
    internal const string LimitMethod = "asymptotic";

    /// <summary>
    /// Two-sided two-sample test. With ties the exact p-value is that of the continuous null (as Hodges 1958
    /// tabulates it), which is conservative because D computed at distinct values can only be smaller.
    /// </summary>
    internal static TestResult TwoSample(ReadOnlySpan<double> x, ReadOnlySpan<double> y)
    {
        double[] xs = SampleChecks.SortedCopy(x, nameof(x));
        double[] ys = SampleChecks.SortedCopy(y, nameof(y));
        int m = xs.Length, n = ys.Length;
        long gap = MaxLatticeGap(xs, ys);
        long mn = (long)m * n;
        double d = (double)gap / mn;
        if (mn <= ExactMaxProduct)
            return new TestResult(d, ExactUpperTail(m, n, gap), ExactMethod);
        return new TestResult(d, LimitSurvival(Lambda(d, m, n)), LimitMethod);
    }

    /// <summary>
    /// Weighted two-sample distance sup |F_w − G_w| (weighted empirical CDFs, evaluated at distinct values)
    /// with the limiting p-value at the Kish (1965) effective counts; approximate, as the weighted null has
    /// no exact distribution.
    /// </summary>
    internal static TestResult WeightedTwoSample(ReadOnlySpan<double> x, ReadOnlySpan<double> xWeights,
        ReadOnlySpan<double> y, ReadOnlySpan<double> yWeights)
    {
        double wx = SampleChecks.SortedWeightedCopy(x, xWeights, nameof(x), out double[] xs, out double[] xw);
        double wy = SampleChecks.SortedWeightedCopy(y, yWeights, nameof(y), out double[] ys, out double[] yw);
        int i = 0, j = 0;
        double cx = 0, cy = 0, d = 0;
        while (i < xs.Length || j < ys.Length)
        {
            double v = i < xs.Length && (j >= ys.Length || xs[i] <= ys[j]) ? xs[i] : ys[j];
            while (i < xs.Length && xs[i] == v) cx += xw[i++];
            while (j < ys.Length && ys[j] == v) cy += yw[j++];
            d = Math.Max(d, Math.Abs(cx / wx - cy / wy));
        }
        double n1 = KishCount(xw), n2 = KishCount(yw);
        return new TestResult(d, BinnedPValue(d, n1, n2), LimitMethod);
    }

    /// <summary>
    /// Exact P(D_{m,n} ≥ d) under the continuous null (Hodges 1958), d in [0, 1].
    /// Throws when m·n exceeds <see cref="ExactMaxProduct"/>.
    /// </summary>
    internal static double ExactPValue(int m, int n, double d)
    {
        if (m <= 0 || n <= 0)
            throw new ArgumentOutOfRangeException(nameof(m), "Sample sizes must be positive.");
        if ((long)m * n > ExactMaxProduct)
            throw new ArgumentOutOfRangeException(nameof(m),
                $"Exact Kolmogorov–Smirnov p-value is limited to m·n ≤ {ExactMaxProduct}; use the limiting distribution.");
        if (double.IsNaN(d))
            throw new ArgumentException("D is NaN.", nameof(d));
        // D·m·n is an integer on the lattice; the small allowance absorbs rounding in a D passed as a double.
        double scaled = d * m * n;
        long threshold = (long)Math.Ceiling(scaled - 1e-7 * Math.Max(1.0, scaled));
        return ExactUpperTail(m, n, threshold);
    }

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

    /// <summary>Kolmogorov limiting distribution function P(K ≤ λ).</summary>
    internal static double LimitCdf(double lambda)
    {
        if (double.IsNaN(lambda))
            throw new ArgumentException("λ is NaN.", nameof(lambda));
        if (lambda <= 0)
            return 0.0;
        if (lambda < SeriesSwitch)
            return SmallLambdaCdf(lambda);
        return 1.0 - LargeLambdaSurvival(lambda);
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

    /// <summary>max over distinct pooled values of |i·n − j·m| (= D·m·n), both inputs sorted.</summary>
    private static long MaxLatticeGap(double[] xs, double[] ys)
    {
        int m = xs.Length, n = ys.Length, i = 0, j = 0;
        long best = 0;
        while (i < m || j < n)
        {
            double v = i < m && (j >= n || xs[i] <= ys[j]) ? xs[i] : ys[j];
            while (i < m && xs[i] == v) i++;
            while (j < n && ys[j] == v) j++;
            best = Math.Max(best, Math.Abs((long)i * n - (long)j * m));
        }
        return best;
    }

    /// <summary>
    /// P(max_k |i_k·n − j_k·m| ≥ threshold) over uniformly random lattice paths from (0,0) to (m,n)
    /// (Hodges 1958). Propagates path probabilities (each step taken with its hypergeometric probability, so
    /// all C(m+n, m) paths are equally likely) and absorbs mass on reaching the boundary: the p-value is the
    /// absorbed mass itself, a sum of positive terms, so small p-values keep full relative precision.
    /// </summary>
    private static double ExactUpperTail(int m, int n, long threshold)
    {
        if (threshold <= 0)
            return 1.0;
        // mass[j] holds the probability of reaching (i, j) without having touched the boundary.
        var mass = new double[n + 1];
        double absorbed = 0;
        mass[0] = 1.0;
        for (int i = 0; i <= m; i++)
        {
            for (int j = 0; j <= n; j++)
            {
                if (i == 0 && j == 0)
                    continue;
                double fromLeft = i > 0 ? mass[j] * (m - i + 1) / (double)(m + n - i + 1 - j) : 0.0;
                double fromBelow = j > 0 ? mass[j - 1] * (n - j + 1) / (double)(m + n - i - j + 1) : 0.0;
                double here = fromLeft + fromBelow;
                if (Math.Abs((long)i * n - (long)j * m) >= threshold)
                {
                    absorbed += here;
                    here = 0;
                }
                mass[j] = here;
            }
        }
        return Math.Clamp(absorbed, 0.0, 1.0);
    }

    private static double KishCount(double[] w)
    {
        double s = 0, s2 = 0;
        foreach (double v in w) { s += v; s2 += v * v; }
        return s * s / s2;
    }
}
