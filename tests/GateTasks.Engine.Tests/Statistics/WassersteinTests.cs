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
}
