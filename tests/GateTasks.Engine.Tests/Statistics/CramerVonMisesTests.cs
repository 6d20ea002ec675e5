using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class CramerVonMisesTests
{
    private static readonly double[] ConoverX = { 7.6, 8.4, 8.6, 8.7, 9.3, 9.9, 10.1, 10.6, 11.2 };
    private static readonly double[] ConoverY = { 5.2, 5.7, 5.9, 6.5, 6.8, 8.2, 9.1, 9.8, 10.8, 11.3, 11.5, 12.3, 12.5, 13.4, 14.6 };

    [Fact]
    public void ConoverExampleAsymptotic()
    {
        var counts = AndersonDarlingTests.CountsPerDistinctValue([ConoverX, ConoverY]);
        var (_, p) = CramerVonMises.FromCounts(counts[0], counts[1]);
        // scipy 1.10.1 cramervonmises_2samp(x, y, method='asymptotic') = 0.1795224560 [scipy];
        // scipy stops its series at terms below 1e-7, so agreement is to that order.
        Near(0.1795224560, p, 0, 2e-7);
    }

    [Fact]
    public void AsymptoticMatchesScipy()
    {
        // scipy 1.10.1 stats.cramervonmises_2samp(x, y, method='asymptotic'), fixture cvm/asymptotic_200_150; the
        // values are distinct, so one bin per value holds the samples exactly.
        var c = Case("cvm", "asymptotic_200_150");
        var counts = AndersonDarlingTests.CountsPerDistinctValue([c.Doubles("x"), c.Doubles("y")]);
        var (t, p) = CramerVonMises.FromCounts(counts[0], counts[1]);
        Near(c.Double("statistic"), t, 1e-12);
        Near(c.Double("pvalue"), p, 0, 2e-7);
    }
}
