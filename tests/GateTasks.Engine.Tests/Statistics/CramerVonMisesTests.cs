using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class CramerVonMisesTests
{
    [Theory]
    // Anderson 1962 exact tail probabilities P(U ≥ u) [published; exact]
    [InlineData(5, 6, 710, 48.0 / 462)]
    [InlineData(7, 7, 1897, 117.0 / 1716)]
    [InlineData(4, 6, 576, 2.0 / 210)]
    [InlineData(6, 7, 1764, 2.0 / 1716)]
    public void ExactTailProbabilities(int m, int n, double u, double expected)
    {
        Near(expected, CramerVonMises.ExactUpperTail(m, n, u), 1e-14);
    }

    private static readonly double[] ConoverX = { 7.6, 8.4, 8.6, 8.7, 9.3, 9.9, 10.1, 10.6, 11.2 };
    private static readonly double[] ConoverY = { 5.2, 5.7, 5.9, 6.5, 6.8, 8.2, 9.1, 9.8, 10.8, 11.3, 11.5, 12.3, 12.5, 13.4, 14.6 };

    [Fact]
    public void ConoverExampleExact()
    {
        CramerVonMisesResult r = CramerVonMises.TwoSample(ConoverX, ConoverY);
        // scipy 1.10.1 cramervonmises_2samp(x, y) [scipy]; Conover 1971 T = 0.262, p ≈ 0.18 [published]
        Assert.Equal(12975, r.U, 9);
        Near(0.2615740741, r.T, 0, 5e-11);
        Near(0.1867543044, r.PValue, 0, 5e-11);
        Assert.Equal(CramerVonMises.ExactMethod, r.Method);
    }

    [Fact]
    public void ConoverExampleAsymptotic()
    {
        CramerVonMisesResult r = CramerVonMises.TwoSampleAsymptotic(ConoverX, ConoverY);
        // scipy 1.10.1 cramervonmises_2samp(x, y, method='asymptotic') = 0.1795224560 [scipy];
        // scipy stops its series at terms below 1e-7, so agreement is to that order.
        Near(0.1795224560, r.PValue, 0, 2e-7);
        Assert.Equal(CramerVonMises.AsymptoticMethod, r.Method);
    }

    [Theory]
    [InlineData("exact_8_11")]
    [InlineData("exact_20_17")]
    public void ExactMatchesScipy(string name)
    {
        // scipy 1.10.1 stats.cramervonmises_2samp(x, y, method='exact'), fixture cvm/<name>
        var c = Case("cvm", name);
        CramerVonMisesResult r = CramerVonMises.TwoSample(c.Doubles("x"), c.Doubles("y"));
        Near(c.Double("statistic"), r.T, 1e-12);
        Near(c.Double("pvalue"), r.PValue, 1e-12);
        Assert.Equal(CramerVonMises.ExactMethod, r.Method);
    }

    [Fact]
    public void AsymptoticMatchesScipy()
    {
        // scipy 1.10.1 stats.cramervonmises_2samp(x, y, method='asymptotic'), fixture cvm/asymptotic_200_150
        var c = Case("cvm", "asymptotic_200_150");
        CramerVonMisesResult r = CramerVonMises.TwoSample(c.Doubles("x"), c.Doubles("y"));
        Near(c.Double("statistic"), r.T, 1e-12);
        Near(c.Double("pvalue"), r.PValue, 0, 2e-7);
        Assert.Equal(CramerVonMises.AsymptoticMethod, r.Method);
    }

    [Fact]
    public void ExactGuardRefusesLargeSamples()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => CramerVonMises.ExactUpperTail(21, 5, 100));
    }
}
