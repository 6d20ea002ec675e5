using GateTasks.Engine.Accumulation;
using GateTasks.Engine.References;
using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class WassersteinTests
{
    [Theory]
    [InlineData("uniform_within_bin_0")]
    [InlineData("uniform_within_bin_1")]
    [InlineData("uniform_within_bin_2")]
    public void UniformWithinBinMatchesNumericalIntegration(string name)
    {
        // scipy 1.10.1 integrate.quad of |F − G| for piecewise-linear CDFs (call in fixture), wasserstein_histogram/<name>
        var c = Case("wasserstein_histogram", name);
        double w = Wasserstein.Histograms(c.Doubles("edges"), c.Doubles("a"), c.Doubles("b"));
        Near(c.Double("distance"), w, 1e-11, 1e-13);
    }

    [Theory]
    [InlineData("lognormal_scale_1.015")]
    [InlineData("pareto_same_law")]
    [InlineData("exponential_scale_1.02")]
    public void FineGridW1OfLongTailedSamplesAgreesWithTheUnbinnedValue(string name)
    {
        var c = Case("wasserstein_long_tail", name);
        var u = c.Doubles("u");
        var v = c.Doubles("v");
        // The reference's path: its fine grid of equal-probability edges from the 2^16-cell quantile grid, then both
        // samples counted on it with their tails' first moments, as a reference build and a check do.
        var grid = new QuantileGrid(u.Min(), u.Max());
        grid.Fine.Fill(u, []);
        var edges = grid.FineEdges(ReferenceBuilder.FineGridBins, ReferenceBuilder.FineGridTailLevels);
        var reference = new FineGridCounter(edges);
        var sample = new FineGridCounter(edges);
        reference.Add(u, []);
        sample.Add(v, []);
        var a = reference.Finish();
        var b = sample.Finish();
        var w = Wasserstein.FineGrid(a.Edges, a.SumW, a.BelowMoment, a.AboveMoment, b.SumW, b.BelowMoment, b.AboveMoment);
        // scipy 1.10.1 scipy.stats.wasserstein_distance(u, v) on the same unbinned values (call in fixture),
        // wasserstein_long_tail/<name>: within 5%.
        Near(c.Double("distance"), w, 0.05);
    }

    [Fact]
    public void FineGridTailsIntegrateBeyondTheOutermostEdgesExactly()
    {
        // Hand-computed from the CDF form W1 = ∫|F − G| dt (Vallender 1974), weight uniform within each cell as the
        // method documents: a = {0.5, 1.5}, b = {0.5, 1.5, 4.0} on edges [0, 1, 2]. F − G is 0 at 0, 1/2 − 1/3 = 1/6
        // at 1 and 1 − 2/3 = 1/3 at 2, linear between: areas 1/12 and 1/4. Beyond 2, F = 1 and 1 − G = 1/3 up to 4:
        // the tail adds (4 − 2)/3, which the tail moment Σ(x − 2) = 2 over b's 3 values gives exactly.
        var edges = new[] { 0.0, 1.0, 2.0 };
        var a = new FineGridCounter(edges);
        var b = new FineGridCounter(edges);
        a.Add([0.5, 1.5], []);
        b.Add([0.5, 1.5, 4.0], []);
        var fa = a.Finish();
        var fb = b.Finish();
        Assert.Equal(2.0, fb.AboveMoment);
        var w = Wasserstein.FineGrid(fa.Edges, fa.SumW, fa.BelowMoment, fa.AboveMoment, fb.SumW, fb.BelowMoment, fb.AboveMoment);
        Assert.Equal(1.0 / 12 + 0.25 + 2.0 / 3, w, 12);
    }
}
