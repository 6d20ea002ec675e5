using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class WassersteinTests
{
    [Fact]
    public void ScipyDocumentationExamples()
    {
        // scipy 1.10 documentation, wasserstein_distance examples [published]
        Near(5.0, Wasserstein.Samples(new double[] { 0, 1, 3 }, new double[] { 5, 6, 8 }), 1e-15);
        Near(0.25, Wasserstein.Samples(new double[] { 0, 1 }, new double[] { 0, 1 }, new double[] { 3, 1 }, new double[] { 2, 2 }), 1e-15);
        Near(4.0781331438047861, Wasserstein.Samples(new[] { 3.4, 3.9, 7.5, 7.8 }, new[] { 4.5, 1.4 },
            new[] { 1.4, 0.9, 3.1, 7.2 }, new[] { 3.2, 3.5 }), 1e-14);
        // W₁ on the energy-distance example inputs = 1.0749128919860629 [scipy]
        Near(1.0749128919860629, Wasserstein.Samples(new[] { 0.7, 7.4, 2.4, 6.8 }, new[] { 1.4, 8.0 },
            new[] { 2.1, 4.2, 7.4, 8.0 }, new[] { 7.6, 8.8 }), 1e-14);
    }

    [Fact]
    public void HistogramAsPointMassesAtBinCentres()
    {
        // scipy 1.10.1 wasserstein_distance(centres, centres, h1, h2) = 0.4642857142857144 [scipy]
        double w = Wasserstein.PointMasses(new[] { 0.5, 1.5, 2.5, 3.5, 4.5 }, new double[] { 3, 7, 10, 6, 2 }, new double[] { 1, 5, 9, 9, 4 });
        Near(0.4642857142857144, w, 1e-14);
    }

    [Theory]
    [InlineData("weighted_500_700")]
    [InlineData("unweighted_ties_300_250")]
    public void SamplesMatchScipy(string name)
    {
        // scipy 1.10.1 stats.wasserstein_distance(u, v[, u_weights, v_weights]), fixture wasserstein/<name>
        var c = Case("wasserstein", name);
        bool weighted = c.TryGetProperty("u_weights", out _);
        double w = weighted
            ? Wasserstein.Samples(c.Doubles("u"), c.Doubles("v"), c.Doubles("u_weights"), c.Doubles("v_weights"))
            : Wasserstein.Samples(c.Doubles("u"), c.Doubles("v"));
        Near(c.Double("distance"), w, 1e-12);
    }

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

    [Fact]
    public void MillionPointTranslation()
    {
        // Exact by construction: W₁ between a sample and its translate by c is |c|.
        const int n = 1_000_000;
        var rng = new Random(12345);
        double[] x = Enumerable.Range(0, n).Select(_ => rng.NextDouble()).ToArray();
        double[] y = x.Select(v => v + 0.25).ToArray();
        Near(0.25, Wasserstein.Samples(x, y), 1e-9);
    }

    [Fact]
    public void IdenticalSamplesHaveZeroDistance()
    {
        double[] x = { 1, 2, 2, 5 };
        Assert.Equal(0.0, Wasserstein.Samples(x, x));
    }
}
