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
    public void LimitMatchesSmirnovTable(double lambda, double expected, double tolerance)
    {
        // The table gives the CDF P(K ≤ λ); the product evaluates the survival function 1 − P(K ≤ λ).
        Near(1 - expected, KolmogorovSmirnov.LimitSurvival(lambda), 0, tolerance);
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
        // scipy 1.10.1 stats.kstwobign.sf, fixture kolmogorov_limit
        var f = Section("kolmogorov_limit");
        double[] lambdas = f.Doubles("lambda"), sf = f.Doubles("sf");
        for (int i = 0; i < lambdas.Length; i++)
            Near(sf[i], KolmogorovSmirnov.LimitSurvival(lambdas[i]), 1e-10, 1e-300);
    }

    [Fact]
    public void FeedTrialsLimit()
    {
        // Feed trials of 12 and 11 values with D = 9/22 [exact; R ks.test]; Kolmogorov-limit p = 0.2920155201
        // [computed from the limiting series]
        Near(0.2920155201, KolmogorovSmirnov.LimitSurvival(KolmogorovSmirnov.Lambda(9.0 / 22, 12, 11)), 0, 5e-11);
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
        // Property of binning (a sup over fewer points), on the scipy fixture sample ks/limit_normal_2000_3000: the
        // unbinned D = scipy 1.10.1 stats.ks_2samp(x, y).statistic and p = stats.kstwobign.sf(sqrt(mn/(m+n)) D).
        var c = Case("ks", "limit_normal_2000_3000");
        double[] x = c.Doubles("x"), y = c.Doubles("y");
        double[] hx = Histogram(x, -4, 4, 40), hy = Histogram(y, -4, 4, 40);
        double d = KolmogorovSmirnov.BinnedDistance(hx, hy);
        Assert.True(d <= c.Double("statistic") + 1e-15);
        double p = KolmogorovSmirnov.BinnedPValue(d, x.Length, y.Length);
        Assert.True(p >= c.Double("pvalue"));
        // With unit weights the effective counts are the sizes, so the p-value is the limit formula.
        Near(KolmogorovSmirnov.LimitSurvival(Math.Sqrt(2000.0 * 3000 / 5000) * d), p, 1e-15);
    }

    [Fact]
    public void EmptySampleIsRejected()
    {
        var e = Assert.Throws<GateInputException>(() => KolmogorovSmirnov.BinnedDistance(new[] { 0.0, 0.0 }, new[] { 1.0, 0.0 }));
        Assert.Equal(ErrorCodes.SampleEmpty, e.Code);
    }

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
