using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class KolmogorovSmirnovTests
{
    [Theory]
    // Smirnov (1948) table of the Kolmogorov distribution [published], to the table's digits.
    [InlineData(0.50, 0.036055, 5e-7)]
    [InlineData(0.99, 0.719126, 5e-7)]
    [InlineData(1.00, 0.730000, 5e-7)]
    [InlineData(1.01, 0.740566, 5e-7)]
    [InlineData(1.50, 0.977782, 5e-7)]
    [InlineData(2.00, 0.999329, 5e-7)]
    [InlineData(2.50, 0.9999925, 5e-8)]
    [InlineData(3.00, 0.99999997, 5e-9)]
    public void LimitCdfMatchesSmirnovTable(double lambda, double expected, double tolerance)
    {
        Near(expected, KolmogorovSmirnov.LimitCdf(lambda), 0, tolerance);
    }

    [Theory]
    // scipy kstwobign.isf(alpha) critical values [scipy], given to 6 decimals.
    [InlineData(0.10, 1.223848)]
    [InlineData(0.05, 1.358099)]
    [InlineData(0.025, 1.480207)]
    [InlineData(0.01, 1.627624)]
    [InlineData(0.005, 1.730818)]
    [InlineData(0.001, 1.949475)]
    public void LimitSurvivalAtCriticalValuesGivesLevel(double alpha, double critical)
    {
        Near(alpha, KolmogorovSmirnov.LimitSurvival(critical), 0, 1e-6);
    }

    [Fact]
    public void LimitMatchesScipyAcrossRange()
    {
        // scipy 1.10.1 stats.kstwobign.cdf / .sf, fixture kolmogorov_limit
        var f = Section("kolmogorov_limit");
        double[] lambdas = f.Doubles("lambda"), cdf = f.Doubles("cdf"), sf = f.Doubles("sf");
        for (int i = 0; i < lambdas.Length; i++)
        {
            Near(cdf[i], KolmogorovSmirnov.LimitCdf(lambdas[i]), 1e-10, 1e-300);
            Near(sf[i], KolmogorovSmirnov.LimitSurvival(lambdas[i]), 1e-10, 1e-300);
        }
    }

    [Theory]
    // [exact] rational values from full enumeration of the permutations
    [InlineData(new[] { 1.01, 2.01 }, new[] { 1.0, 2, 3, 4 }, 1.0 / 2, 14.0 / 15)]
    [InlineData(new[] { 0.99, 1.99 }, new[] { 1.0, 2, 3, 4 }, 3.0 / 4, 2.0 / 5)]
    [InlineData(new[] { 1.0, 3, 5, 6, 9, 10 }, new[] { 2.0, 4, 7, 8 }, 1.0 / 3, 97.0 / 105)]
    public void ExactSmallCases(double[] x, double[] y, double d, double p)
    {
        TestResult r = KolmogorovSmirnov.TwoSample(x, y);
        Near(d, r.Statistic, 1e-15);
        Near(p, r.PValue, 1e-13);
        Assert.Equal(KolmogorovSmirnov.ExactMethod, r.Method);
    }

    private static readonly double[] FeedX = { 368, 390, 379, 260, 404, 318, 352, 359, 216, 222, 283, 332 };
    private static readonly double[] FeedY = { 325, 257, 303, 315, 380, 153, 263, 242, 206, 344, 258 };

    [Fact]
    public void FeedTrialsExactAndLimit()
    {
        TestResult r = KolmogorovSmirnov.TwoSample(FeedX, FeedY);
        // [exact] D = 9/22, p = 132289/676039 (R ks.test 0.1956825)
        Near(9.0 / 22, r.Statistic, 1e-15);
        Near(132289.0 / 676039, r.PValue, 1e-12);
        // Kolmogorov-limit p = 0.2920155201 [computed from the limiting series]
        Near(0.2920155201, KolmogorovSmirnov.LimitSurvival(KolmogorovSmirnov.Lambda(r.Statistic, 12, 11)), 0, 5e-11);
    }

    [Fact]
    public void LargeSquaresCaseUsesLimit()
    {
        double[] x = Enumerable.Range(0, 2000).Select(i => (double)i * i).ToArray();
        double[] y = Enumerable.Range(-150, 2150).Select(i => (double)i * i).ToArray();
        TestResult r = KolmogorovSmirnov.TwoSample(x, y);
        // D = 0.0645, limit p = 0.0003604729 [R ks.test] (y has ties: i² for ±i)
        Near(0.0645, r.Statistic, 1e-12);
        Near(0.0003604729, r.PValue, 0, 5e-11);
        Assert.Equal(KolmogorovSmirnov.LimitMethod, r.Method);
    }

    [Theory]
    // Exact two-sample critical values [published: two-sample tables]: D ≥ crit rejects at α,
    // so P(D ≥ crit) ≤ α while the next smaller lattice value does not reject.
    [InlineData(5, 8, 30.0 / 40, 0.05)]
    [InlineData(5, 8, 35.0 / 40, 0.01)]
    [InlineData(8, 8, 48.0 / 64, 0.05)]
    [InlineData(8, 8, 56.0 / 64, 0.01)]
    [InlineData(10, 10, 70.0 / 100, 0.05)]
    [InlineData(10, 10, 80.0 / 100, 0.01)]
    public void ExactCriticalValues(int m, int n, double critical, double alpha)
    {
        Assert.True(KolmogorovSmirnov.ExactPValue(m, n, critical) <= alpha);
        Assert.True(KolmogorovSmirnov.ExactPValue(m, n, LargestLatticeValueBelow(m, n, critical)) > alpha);
    }

    /// <summary>Largest attainable D = |i·n − j·m|/(mn) below d, by enumerating the lattice.</summary>
    private static double LargestLatticeValueBelow(int m, int n, double d)
    {
        long target = (long)Math.Round(d * m * n), best = 0;
        for (long i = 0; i <= m; i++)
            for (long j = 0; j <= n; j++)
            {
                long g = Math.Abs(i * n - j * m);
                if (g < target && g > best) best = g;
            }
        return (double)best / ((long)m * n);
    }

    [Fact]
    public void ExactPValueFiveEight()
    {
        // (m,n) = (5,8), P(D ≥ 30/40) = 0.04196 [published: two-sample tables]
        Near(0.04196, KolmogorovSmirnov.ExactPValue(5, 8, 30.0 / 40), 0, 5e-6);
    }

    [Theory]
    [InlineData("exact_normal_37_53")]
    [InlineData("exact_ties_60_80")]
    [InlineData("exact_exponential_100_100")]
    public void ExactMatchesScipy(string name)
    {
        // scipy 1.10.1 stats.ks_2samp(x, y, method='exact'), fixture ks/<name>
        var c = Case("ks", name);
        TestResult r = KolmogorovSmirnov.TwoSample(c.Doubles("x"), c.Doubles("y"));
        Near(c.Double("statistic"), r.Statistic, 1e-14);
        Near(c.Double("pvalue"), r.PValue, 1e-9);
        Assert.Equal(KolmogorovSmirnov.ExactMethod, r.Method);
    }

    [Fact]
    public void LimitMatchesScipyOnLargerSample()
    {
        // D = scipy 1.10.1 stats.ks_2samp(x, y).statistic, p = stats.kstwobign.sf(sqrt(mn/(m+n)) D), fixture ks/limit_normal_2000_3000
        var c = Case("ks", "limit_normal_2000_3000");
        TestResult r = KolmogorovSmirnov.TwoSample(c.Doubles("x"), c.Doubles("y"));
        Near(c.Double("statistic"), r.Statistic, 1e-14);
        Near(c.Double("pvalue"), r.PValue, 1e-10);
        Assert.Equal(KolmogorovSmirnov.LimitMethod, r.Method);
    }

    [Fact]
    public void TiesAreEvaluatedAtDistinctValues()
    {
        // Hand computation: after 1: 1/4 vs 0; after 2: 3/4 vs 3/4; after 3: 1 vs 3/4 → D = 1/4 [exact].
        // Stepping through tied points one by one would report 3/4.
        TestResult r = KolmogorovSmirnov.TwoSample(new[] { 1.0, 2, 2, 3 }, new[] { 2.0, 2, 2, 4 });
        Near(0.25, r.Statistic, 1e-15);
    }

    [Fact]
    public void BinnedDistanceOfKnownHistograms()
    {
        // Hand computation [exact]: cumulative [3,10,20,26,28]/28 vs [1,6,15,24,28]/28 → max gap 5/28.
        double d = KolmogorovSmirnov.BinnedDistance(new double[] { 3, 7, 10, 6, 2 }, new double[] { 1, 5, 9, 9, 4 });
        Near(5.0 / 28, d, 1e-15);
    }

    [Fact]
    public void BinnedDistanceIsLowerBoundAndPValueConservative()
    {
        // Property of binning (a sup over fewer points), on the scipy fixture sample ks/limit_normal_2000_3000.
        var c = Case("ks", "limit_normal_2000_3000");
        double[] x = c.Doubles("x"), y = c.Doubles("y");
        TestResult unbinned = KolmogorovSmirnov.TwoSample(x, y);
        double[] hx = Histogram(x, -4, 4, 40), hy = Histogram(y, -4, 4, 40);
        double d = KolmogorovSmirnov.BinnedDistance(hx, hy);
        Assert.True(d <= unbinned.Statistic + 1e-15);
        double p = KolmogorovSmirnov.BinnedPValue(d, x.Length, y.Length);
        Assert.True(p >= unbinned.PValue);
        // With unit weights the effective counts are the sizes, so the p-value is the limit formula.
        Near(KolmogorovSmirnov.LimitSurvival(Math.Sqrt(2000.0 * 3000 / 5000) * d), p, 1e-15);
    }

    [Fact]
    public void WeightedWithUnitWeightsEqualsUnweightedDistance()
    {
        // Consistency with the unweighted statistic on scipy fixture data ks/exact_ties_60_80 (ties included).
        var c = Case("ks", "exact_ties_60_80");
        double[] x = c.Doubles("x"), y = c.Doubles("y");
        TestResult w = KolmogorovSmirnov.WeightedTwoSample(x, Ones(x.Length), y, Ones(y.Length));
        Near(c.Double("statistic"), w.Statistic, 1e-14);
        Near(KolmogorovSmirnov.LimitSurvival(KolmogorovSmirnov.Lambda(w.Statistic, x.Length, y.Length)), w.PValue, 1e-12);
    }

    [Fact]
    public void MillionPointShiftedGrid()
    {
        // Exact by construction: x = i/N, y = x + 1/100 (N = 10⁶), so sup|F − G| = 1/100; the p-value is the
        // Kolmogorov limit at λ = √(N/2)·D, far in the tail.
        const int n = 1_000_000;
        double[] x = Enumerable.Range(0, n).Select(i => (double)i / n).ToArray();
        double[] y = Enumerable.Range(10_000, n).Select(i => (double)i / n).ToArray();
        TestResult r = KolmogorovSmirnov.TwoSample(x, y);
        Near(0.01, r.Statistic, 1e-12);
        Near(KolmogorovSmirnov.LimitSurvival(Math.Sqrt(n / 2.0) * 0.01), r.PValue, 1e-12, 1e-300);
    }

    [Fact]
    public void EmptySampleIsRejected()
    {
        var e = Assert.Throws<GateInputException>(() => KolmogorovSmirnov.TwoSample(Array.Empty<double>(), new[] { 1.0 }));
        Assert.Equal(ErrorCodes.SampleEmpty, e.Code);
    }

    [Fact]
    public void ExactGuardRefusesLargeSamples()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => KolmogorovSmirnov.ExactPValue(101, 100, 0.1));
    }

    private static double[] Ones(int n) => Enumerable.Repeat(1.0, n).ToArray();

    private static double[] Histogram(double[] values, double lo, double hi, int bins)
    {
        var h = new double[bins + 2]; // under/overflow as first and last entries
        foreach (double v in values)
        {
            int b = v < lo ? 0 : v >= hi ? bins + 1 : 1 + (int)((v - lo) / (hi - lo) * bins);
            h[Math.Min(b, bins + 1)]++;
        }
        return h;
    }
}
