using GateTasks.Engine.Statistics;
using MathNet.Numerics.Random;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class DkwBoundTests
{
    [Fact]
    public void EpsilonHandComputed()
    {
        // [exact, hand-computed] ε = √(ln(2/α)/(2n)) (Dvoretzky, Kiefer & Wolfowitz 1956; Massart 1990):
        // α = 2/e:     ln e = 1,   n = 50:  √(1/100) = 0.1
        Near(0.1, DkwBound.Epsilon(50, 2 / Math.E), 1e-14);
        // α = 2e⁻²:   ln e² = 2,  n = 100: √(2/200) = 0.1
        Near(0.1, DkwBound.Epsilon(100, 2 * Math.Exp(-2)), 1e-14);
        // α = 0.05:   ln 40 = 3 ln 2 + ln 5 = 2.0794415417 + 1.6094379124 = 3.6888794541,
        //             n = 100: √(3.6888794541/200) = √0.0184443973 = 0.1358101516;
        //             n = 200: 0.1358101516/√2 = 0.0960322791
        Near(0.1358101516, DkwBound.Epsilon(100, 0.05), 0, 1e-10);
        Near(0.0960322791, DkwBound.Epsilon(200, 0.05), 0, 1e-10);
        // Non-integer (effective) sizes: n = 12.5, α = 2e⁻¹: √(1/25) = 0.2
        Near(0.2, DkwBound.Epsilon(12.5, 2 / Math.E), 1e-14);
    }

    [Fact]
    public void TwoSampleHalfWidthHandComputed()
    {
        // [exact, hand-computed] α = 4e⁻², so each sample gets α/2 = 2e⁻² and ln(2/(α/2)) = 2:
        // n1 = 100: √(2/200) = 0.1;  n2 = 25: √(2/50) = 0.2;  sum 0.3.
        Near(0.3, DkwBound.TwoSampleHalfWidth(100, 25, 4 * Math.Exp(-2)), 1e-14);
        // α = 0.05 split in two: ln(2/0.025) = ln 80 = 4 ln 2 + ln 5 = 2.7725887222 + 1.6094379124 = 4.3820266347;
        // n1 = n2 = 200: 2·√(4.3820266347/400) = 2·√0.0109550666 = 2·0.1046664540 = 0.2093329079
        Near(0.2093329079, DkwBound.TwoSampleHalfWidth(200, 200, 0.05), 0, 1e-9);
    }

    [Fact]
    public void CoverageOfUniformSamples()
    {
        // Massart (1990): P(sup|F_n − F| > ε) ≤ α for every n and continuous F. 2000 replicas of n = 200
        // uniforms, fixed seed; D = max_i max(i/n − u_(i), u_(i) − (i − 1)/n). The bound is nearly tight
        // here (for orientation, not asserted: scipy 1.10.1 stats.kstwo.cdf(ε, 200) = 0.9533), so the Monte-Carlo estimate, whose standard error is
        // √(0.95·0.05/2000) ≈ 0.0049, is required to reach 95% less three standard errors rather than 95%
        // itself, and to stay below 97% (Massart's constant is tight, not loose).
        const int n = 200, replicas = 2000;
        double epsilon = DkwBound.Epsilon(n, 0.05);
        var rng = new Xoshiro256StarStar(20240611);
        var u = new double[n];
        int covered = 0;
        for (int r = 0; r < replicas; r++)
        {
            for (int i = 0; i < n; i++)
                u[i] = rng.NextDouble();
            Array.Sort(u);
            double d = 0;
            for (int i = 0; i < n; i++)
                d = Math.Max(d, Math.Max((i + 1.0) / n - u[i], u[i] - (double)i / n));
            if (d <= epsilon)
                covered++;
        }
        double coverage = (double)covered / replicas;
        double standardError = Math.Sqrt(0.95 * 0.05 / replicas);
        Assert.True(coverage >= 0.95 - 3 * standardError, FormattableString.Invariant($"coverage {coverage}"));
        Assert.True(coverage < 0.97, FormattableString.Invariant($"coverage {coverage}"));
    }

    [Fact]
    public void BadArgumentsAreRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => DkwBound.Epsilon(0, 0.05));
        Assert.Throws<ArgumentOutOfRangeException>(() => DkwBound.Epsilon(double.NaN, 0.05));
        Assert.Throws<ArgumentOutOfRangeException>(() => DkwBound.Epsilon(100, 0));
        Assert.Throws<ArgumentOutOfRangeException>(() => DkwBound.Epsilon(100, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() => DkwBound.TwoSampleHalfWidth(100, 100, 1.2));
        Assert.Throws<ArgumentOutOfRangeException>(() => DkwBound.TwoSampleHalfWidth(100, -1, 0.05));
    }
}
