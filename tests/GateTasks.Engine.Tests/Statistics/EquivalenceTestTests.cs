using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class EquivalenceTestTests
{
    /// <summary>Difference of means and its pooled-variance standard error, df = n1 + n2 − 2.</summary>
    private static (double D, double Se, double Df) Pooled(double mean1, double sd1, int n1, double mean2, double sd2, int n2)
    {
        double df = n1 + n2 - 2;
        double pooledVariance = ((n1 - 1) * sd1 * sd1 + (n2 - 1) * sd2 * sd2) / df;
        return (mean1 - mean2, Math.Sqrt(pooledVariance * (1.0 / n1 + 1.0 / n2)), df);
    }

    [Fact]
    public void StegnerExample()
    {
        // Stegner et al. 1996: means 1.6764 (SD 0.4748, n 70) − 1.5679 (SD 0.4285, n 64), bounds ±0.3136.
        (double d, double se, double df) = Pooled(1.6764, 0.4748, 70, 1.5679, 0.4285, 64);
        (double tLower, double tUpper) = EquivalenceTest.Statistics(d, se, -0.3136, 0.3136);
        // t = 5.383 and −2.616 [published]; the full-precision pooled SE gives 5.3842, so
        // the published 5.383 carries ~1e-3 of rounding from its intermediate values.
        Near(5.383, tLower, 0, 1.5e-3);
        Near(-2.616, tUpper, 0, 5e-4);
        // p_TOST with df 132 = 0.0049636 [computed].
        Assert.Equal(132, df);
        Near(0.0049636, EquivalenceTest.PValue(d, se, -0.3136, 0.3136, df), 0, 5e-8);
    }

    [Fact]
    public void QuertemontExample()
    {
        // Quertemont 2011, Table 1: 407.24 (SD 41.77) vs 402.98 (SD 41.79), n = 150 each, bounds ±15.
        (double d, double se, double df) = Pooled(407.24, 41.77, 150, 402.98, 41.79, 150);
        (_, double tUpper) = EquivalenceTest.Statistics(d, se, -15, 15);
        // t(298) = −2.23 [published]; computed −2.2262 from the table's means, SDs and n [computed].
        Assert.Equal(298, df);
        Near(-2.23, tUpper, 0, 5e-3);
        Near(-2.2262, tUpper, 0, 5e-5);
        double p = EquivalenceTest.PValue(d, se, -15, 15, df);
        // p = .013 [published]; computed 0.013374 from the same [computed].
        Near(0.013, p, 0, 5e-4);
        Near(0.013374, p, 0, 5e-7);
    }

    [Fact]
    public void NormalTostEqualsTheIntervalInclusionRule()
    {
        // Schuirmann 1987: TOST at α rejects exactly when the (1 − 2α) interval d ± z_{1−α}·se lies inside the
        // bounds [published]. With the lower bound placed on the 95% one-sided lower limit
        // and the upper bound far away, p_TOST = 0.05.
        double d = 0.3, se = 0.1;
        double lower = EquivalenceTest.LowerBound(d, se, 0.95);
        Near(0.05, EquivalenceTest.PValue(d, se, lower, 10), 1e-12);
        Assert.True(EquivalenceTest.PValue(d, se, lower - 1e-3, 10) < 0.05);
        Assert.True(EquivalenceTest.PValue(d, se, lower + 1e-3, 10) > 0.05);
    }

    [Fact]
    public void StudentTApproachesNormalForLargeDegreesOfFreedom()
    {
        // Student's t tends to the standard normal as df → ∞ (Student 1908) [exact limit].
        double normal = EquivalenceTest.PValue(0.1, 0.08, -0.3, 0.3);
        Near(normal, EquivalenceTest.PValue(0.1, 0.08, -0.3, 0.3, 1e7), 1e-5);
        Assert.True(EquivalenceTest.PValue(0.1, 0.08, -0.3, 0.3, 10) > normal); // heavier tails, larger p
    }

    [Fact]
    public void PValueAboveAtTheOneSidedQuantile()
    {
        // Standard normal upper 5% point z = 1.644854 (standard normal tables, e.g. Abramowitz & Stegun 1964, ch. 26).
        double se = 0.02, tolerance = 0.1;
        Near(0.05, EquivalenceTest.PValueAbove(tolerance + 1.644854 * se, se, tolerance), 0, 1e-7);
        // At estimate = tolerance the upper tail is exactly 1/2 [exact, symmetry of the normal].
        Assert.Equal(0.5, EquivalenceTest.PValueAbove(tolerance, se, tolerance), 15);
        // An estimate far below the tolerance gives no evidence of exceeding it.
        Assert.True(EquivalenceTest.PValueAbove(0.0, se, tolerance) > 0.999);
    }

    [Fact]
    public void OneSidedBounds()
    {
        // z_0.975 = 1.959964 and z_0.95 = 1.644854 (standard normal tables, Abramowitz & Stegun 1964, ch. 26).
        Near(2 + 1.959964 * 0.5, EquivalenceTest.UpperBound(2, 0.5, 0.975), 0, 5e-7);
        Near(2 - 1.644854 * 0.5, EquivalenceTest.LowerBound(2, 0.5, 0.95), 0, 5e-7);
        // Duality with PValueAbove: the tolerance at the 95% lower bound has p = 0.05 [exact, by definition].
        double lower = EquivalenceTest.LowerBound(0.2, 0.03, 0.95);
        Near(0.05, EquivalenceTest.PValueAbove(0.2, 0.03, lower), 1e-12);
    }

    [Fact]
    public void BadArgumentsAreRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => EquivalenceTest.PValue(0, 0, -1, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() => EquivalenceTest.PValue(double.NaN, 1, -1, 1));
        Assert.Throws<ArgumentException>(() => EquivalenceTest.PValue(0, 1, 1, -1));
        Assert.Throws<ArgumentOutOfRangeException>(() => EquivalenceTest.PValue(0, 1, -1, 1, 0));
        Assert.Throws<ArgumentOutOfRangeException>(() => EquivalenceTest.PValueAbove(0, -1, 0.1));
        Assert.Throws<ArgumentOutOfRangeException>(() => EquivalenceTest.UpperBound(0, 1, 1));
    }
}
