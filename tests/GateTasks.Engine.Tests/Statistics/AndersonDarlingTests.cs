using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class AndersonDarlingTests
{
    private static readonly double[][] Laboratories =
    {
        new[] { 38.7, 41.5, 43.8, 44.5, 45.5, 46.0, 47.7, 58.0 },
        new[] { 39.2, 39.3, 39.7, 41.4, 41.8, 42.9, 43.3, 45.8 },
        new[] { 34.0, 35.0, 39.0, 40.0, 43.0, 43.0, 44.0, 45.0 },
        new[] { 34.0, 34.8, 34.8, 35.4, 37.2, 37.8, 41.2, 42.8 },
    };

    /// <summary>
    /// Each sample's count per distinct pooled value, in increasing order: one bin per distinct value holds the
    /// samples exactly, ties included, so the binned statistic is the tie-adjusted statistic of the raw samples.
    /// </summary>
    internal static double[][] CountsPerDistinctValue(double[][] samples)
    {
        double[] distinct = samples.SelectMany(s => s).Distinct().Order().ToArray();
        return samples.Select(s =>
        {
            var counts = new double[distinct.Length];
            foreach (double v in s) counts[Array.BinarySearch(distinct, v)]++;
            return counts;
        }).ToArray();
    }

    [Fact]
    public void PaperExampleFourLaboratories()
    {
        var (a2akN, sigma, takN, pAkN) = AndersonDarling.TieAdjustedFromCounts(CountsPerDistinctValue(Laboratories));
        // Scholz & Stephens 1987, paper-smoothness example [published], full precision values
        Near(8.392609, a2akN, 0, 5e-7);
        Near(1.203766, sigma, 0, 5e-7);
        Near(4.479781, takN, 0, 5e-7);
        // Scholz & Stephens 1987 example, asymptotic p ≈ 0.0022 [published]; it lies beyond the tabulated 0.01
        // level, so it comes from extrapolation (agreement to 1e-4).
        Near(0.0022, pAkN, 0, 1e-4);
        Assert.True(AndersonDarling.PValue(takN, 3).Extrapolated);
    }

    [Fact]
    public void ScholzThreeSampleCase()
    {
        var samples = new[]
        {
            new double[] { 1, 3, 2, 5, 7 },
            new double[] { 2, 8, 1, 6, 9, 4 },
            new double[] { 12, 5, 7, 9, 11 },
        };
        var (_, sigma, takN, pAkN) = AndersonDarling.TieAdjustedFromCounts(CountsPerDistinctValue(samples));
        // Scholz's software documentation, 3-sample case [published]
        Near(0.92837, sigma, 0, 5e-6);
        Near(1.62856, takN, 0, 5e-6);
        Near(0.07084, pAkN, 0, 5e-6);
        Assert.False(AndersonDarling.PValue(takN, 2).Extrapolated);
    }

    [Theory]
    [InlineData("continuous_3")]
    [InlineData("ties_3")]
    public void StandardisedStatisticMatchesScipy(string name)
    {
        // scipy 1.10.1 stats.anderson_ksamp(samples, midrank=True).statistic (T_akN), fixture anderson_ksamp/<name>;
        // scipy's p-values use a different interpolation and are not compared.
        var c = Case("anderson_ksamp", name);
        double[][] samples = c.GetProperty("samples").EnumerateArray()
            .Select(s => s.EnumerateArray().Select(v => v.GetDouble()).ToArray()).ToArray();
        var (_, _, takN, _) = AndersonDarling.TieAdjustedFromCounts(CountsPerDistinctValue(samples));
        Near(c.Double("t_akn"), takN, 1e-10);
    }

    [Theory]
    // Scholz & Stephens 1987, Table 1 (m = 1 and m = ∞ rows): at a tabulated quantile the interpolated p-value
    // is close to its level (the fits are least squares, not exact interpolation).
    [InlineData(1, 1.225, 0.10)]
    [InlineData(1, 2.719, 0.025)]
    [InlineData(1000000, 1.645, 0.05)]
    public void PValueNearTabulatedLevels(int m, double quantile, double level)
    {
        (double p, bool extrapolated) = AndersonDarling.PValue(quantile, m);
        Assert.False(extrapolated);
        Near(level, p, 0.05);
    }

    [Fact]
    public void IdenticalValuesAreRejected()
    {
        Assert.Throws<ArgumentException>(() => AndersonDarling.TieAdjustedFromCounts(
            CountsPerDistinctValue(new[] { new[] { 1.0, 1.0 }, new[] { 1.0, 1.0 } })));
    }
}
