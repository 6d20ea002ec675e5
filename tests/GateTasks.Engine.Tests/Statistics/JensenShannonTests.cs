using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class JensenShannonTests
{
    [Fact]
    public void ScipyDocumentationValues()
    {
        // scipy documentation jensenshannon examples (√JSD, so the test takes the root of the divergence) [published]
        Near(1.0, Math.Sqrt(JensenShannon.Divergence(new double[] { 1, 0, 0 }, new double[] { 0, 1, 0 }, 2.0)), 1e-15);
        Near(0.46450140402245893, Math.Sqrt(JensenShannon.Divergence(new double[] { 1, 0 }, new[] { 0.5, 0.5 })), 1e-14);
    }

    [Fact]
    public void DivergenceAgainstUniform()
    {
        double[] p = { 0.1, 0.2, 0.3, 0.4 }, q = { 1, 1, 1, 1 };
        // scipy 1.10.1 jensenshannon(p, uniform) [scipy]: √JSD 0.16692996572597965,
        // JSD 0.02786561345727674 nats, 0.04020158234614192 bits
        Near(0.16692996572597965, Math.Sqrt(JensenShannon.Divergence(p, q)), 1e-13);
        Near(0.02786561345727674, JensenShannon.Divergence(p, q), 1e-13);
        Near(0.04020158234614192, JensenShannon.Divergence(p, q, 2.0), 1e-13);
    }

    [Theory]
    [InlineData("random_20_base_2.718")]
    [InlineData("random_20_base_2")]
    public void MatchesScipyOnUnnormalisedVectors(string name)
    {
        // scipy 1.10.1 spatial.distance.jensenshannon(p, q, base) ** 2, fixture jensenshannon/<name>
        var c = Case("jensenshannon", name);
        Near(c.Double("divergence"), JensenShannon.Divergence(c.Doubles("p"), c.Doubles("q"), c.Double("base")), 1e-12);
    }
}
