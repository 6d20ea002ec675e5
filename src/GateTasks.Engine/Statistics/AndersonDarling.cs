using MathNet.Numerics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// k-sample Anderson–Darling test on binned data (Scholz &amp; Stephens 1987, JASA 82:918): the tie-adjusted
/// statistic (their eq. 7 adjusted for ties), variance σ_N² from their eq. 4, p-values by their interpolation of Table 1.
/// </summary>
internal static class AndersonDarling
{
    /// <summary>
    /// The tie-adjusted statistic A²akN, σ_N, T and its p-value from binned data: <paramref name="counts"/>[i][j] is
    /// the number of events of sample i in bin j, bins in increasing order — each bin one distinct value of the
    /// pooled sample, exactly the tied data the statistic was made for (Scholz &amp; Stephens 1987, eq. 7 adjusted).
    /// Counts may be effective (non-integer) counts of weighted samples, an approximation.
    /// </summary>
    internal static (double A2akN, double Sigma, double T, double PValue) TieAdjustedFromCounts(IReadOnlyList<double[]> counts)
    {
        var k = counts.Count;
        if (k < 2) throw new ArgumentException("The k-sample Anderson–Darling test needs at least two samples.", nameof(counts));
        var bins = counts[0].Length;
        var sizes = counts.Select(c => c.Sum()).ToArray();
        var n = sizes.Sum();
        if (sizes.Any(x => !(x > 0)) || n < 4) throw new ArgumentException("Every sample needs entries, and four in total.", nameof(counts));
        var cumulative = new double[k];
        double b = 0, sum = 0;
        var occupied = 0;
        for (var j = 0; j < bins; j++)
        {
            double l = 0;
            for (var i = 0; i < k; i++) l += counts[i][j];
            if (l <= 0) continue;
            occupied++;
            b += l;
            var ba = b - l / 2;
            var denom = ba * (n - ba) - n * l / 4;
            for (var i = 0; i < k; i++)
            {
                cumulative[i] += counts[i][j];
                if (denom <= 0) continue;
                var r = n * (cumulative[i] - counts[i][j] / 2) - sizes[i] * ba;
                sum += l * r * r / denom / sizes[i];
            }
        }
        if (occupied < 2) throw new ArgumentException("All observations fall in one bin; the Anderson–Darling statistic is undefined.", nameof(counts));
        var a2 = sum * (n - 1) / (n * n);
        var intSizes = sizes.Select(x => (int)Math.Max(1, Math.Round(x))).ToArray();
        var sigma = Math.Sqrt(Variance(intSizes, intSizes.Sum()));
        var t = (a2 - (k - 1)) / sigma;
        return (a2, sigma, t, PValue(t, k - 1).PValue);
    }

    /// <summary>
    /// Asymptotic P(T_m ≥ t) by Scholz &amp; Stephens' (1987) interpolation of their Table 1: for each upper
    /// level α ∈ {0.25, 0.10, 0.05, 0.025, 0.01} the tabulated quantiles t_m(α) are fitted by least squares
    /// as a quadratic in 1/√m and evaluated at m; then log(α/(1−α)) is fitted as a quadratic in those
    /// quantiles and evaluated at t. Outside the quantile range the fitted quadratic is continued linearly
    /// from its end point (value and slope), and the result is flagged as extrapolated.
    /// </summary>
    internal static (double PValue, bool Extrapolated) PValue(double t, int m)
    {
        if (m < 1)
            throw new ArgumentOutOfRangeException(nameof(m), "m = k − 1 must be at least 1.");
        if (double.IsNaN(t))
            throw new ArgumentException("T is NaN.", nameof(t));
        double x = 1.0 / Math.Sqrt(m);
        var quantiles = new double[Levels.Length];
        for (int a = 0; a < Levels.Length; a++)
        {
            double[] c = Fit.Polynomial(InverseRootM, Table1[a], 2);
            quantiles[a] = c[0] + c[1] * x + c[2] * x * x;
        }
        var logOdds = new double[Levels.Length];
        for (int a = 0; a < Levels.Length; a++)
            logOdds[a] = Math.Log(Levels[a] / (1 - Levels[a]));
        double[] f = Fit.Polynomial(quantiles, logOdds, 2);
        double lo = quantiles.Min(), hi = quantiles.Max();
        double FitAt(double v) => f[0] + f[1] * v + f[2] * v * v;
        double SlopeAt(double v) => f[1] + 2 * f[2] * v;
        double lp;
        bool extrapolated = false;
        if (t > hi) { lp = FitAt(hi) + (t - hi) * SlopeAt(hi); extrapolated = true; }
        else if (t < lo) { lp = FitAt(lo) + (t - lo) * SlopeAt(lo); extrapolated = true; }
        else lp = FitAt(t);
        return (1.0 / (1.0 + Math.Exp(-lp)), extrapolated);
    }

    // Scholz & Stephens 1987, Table 1: upper quantiles of T_m for m = 1, 2, 3, 4, 6, 8, 10, ∞.
    private static readonly double[] Levels = { 0.25, 0.10, 0.05, 0.025, 0.01 };
    private static readonly double[] InverseRootM =
        { 1.0, 1 / Math.Sqrt(2), 1 / Math.Sqrt(3), 0.5, 1 / Math.Sqrt(6), 1 / Math.Sqrt(8), 1 / Math.Sqrt(10), 0.0 };
    private static readonly double[][] Table1 =
    {
        new[] { 0.326, 0.449, 0.498, 0.525, 0.557, 0.576, 0.590, 0.674 },
        new[] { 1.225, 1.309, 1.324, 1.329, 1.332, 1.330, 1.329, 1.282 },
        new[] { 1.960, 1.945, 1.915, 1.894, 1.859, 1.839, 1.823, 1.645 },
        new[] { 2.719, 2.576, 2.493, 2.438, 2.365, 2.318, 2.284, 1.960 },
        new[] { 3.752, 3.414, 3.246, 3.139, 3.005, 2.920, 2.862, 2.326 },
    };

    /// <summary>σ_N² of A²kN under the null (Scholz &amp; Stephens 1987, eq. 4).</summary>
    private static double Variance(int[] sizes, int bigN)
    {
        double n = bigN, k = sizes.Length;
        double h = 0, bigH = 0, g = 0;
        foreach (int s in sizes) bigH += 1.0 / s;
        for (int i = 1; i < bigN; i++) h += 1.0 / i;
        // g = Σ_{i=1}^{N−2} Σ_{j=i+1}^{N−1} 1/((N−i) j) = Σ_{j=2}^{N−1} (1/j) Σ_{i=1}^{j−1} 1/(N−i), in O(N).
        double inner = 0;
        for (int j = 2; j < bigN; j++)
        {
            inner += 1.0 / (n - (j - 1));
            g += inner / j;
        }
        double a = (4 * g - 6) * (k - 1) + (10 - 6 * g) * bigH;
        double bb = (2 * g - 4) * k * k + 8 * h * k + (2 * g - 14 * h - 4) * bigH - 8 * h + 4 * g - 6;
        double c = (6 * h + 2 * g - 2) * k * k + (4 * h - 4 * g + 6) * k + (2 * h - 6) * bigH + 4 * h;
        double d = (2 * h + 6) * k * k - 4 * h * k;
        return (a * n * n * n + bb * n * n + c * n + d) / ((n - 1) * (n - 2) * (n - 3));
    }
}
