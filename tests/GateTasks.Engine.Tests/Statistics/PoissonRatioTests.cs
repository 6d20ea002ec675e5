using System.Text.Json;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

public class PoissonRatioTests
{
    // tests/fixtures/scipy/poisson_ratio.json, written by tests/fixtures/scipy/make_ratio_fixtures.py with Debian's
    // python3-scipy 1.10.1 / numpy 1.24.2; each case records its call (scipy.stats.binom.sf/cdf for integer counts,
    // scipy.special.betainc for effective ones, scipy.stats.beta.ppf for the Clopper-Pearson bounds).
    private static readonly Lazy<JsonDocument> Fixture = new(() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "scipy", "poisson_ratio.json"))));

    public static TheoryData<string> Cases()
    {
        var data = new TheoryData<string>();
        foreach (var c in Fixture.Value.RootElement.GetProperty("poisson_ratio").EnumerateArray()) data.Add(c.GetProperty("name").GetString()!);
        return data;
    }

    private static JsonElement Case(string name) =>
        Fixture.Value.RootElement.GetProperty("poisson_ratio").EnumerateArray().Single(c => c.GetProperty("name").GetString() == name);

    [Theory]
    [MemberData(nameof(Cases))]
    public void Tails_and_bounds_agree_with_scipy(string name)
    {
        var c = Case(name);
        double k = c.Double("k"), n = c.Double("n"), pi = c.Double("pi"), conf = c.Double("confidence");
        ScipyFixture.Near(c.Double("upper_tail"), PoissonRatio.UpperTail(k, n, pi), 1e-9, 1e-14);
        ScipyFixture.Near(c.Double("lower_tail"), PoissonRatio.LowerTail(k, n, pi), 1e-9, 1e-14);
        var (lo, hi) = PoissonRatio.Bounds(k, n, conf);
        ScipyFixture.Near(c.Double("bound_lower"), lo, 1e-7, 1e-12);
        ScipyFixture.Near(c.Double("bound_upper"), hi, 1e-7, 1e-12);
    }

    [Fact]
    public void Share_and_ratio_are_inverse()
    {
        // π = ρ·s₁/(ρ·s₁ + s₂) by definition; 1.5·200/(1.5·200 + 400) = 3/7, by hand.
        Assert.Equal(3.0 / 7, PoissonRatio.Share(1.5, 200, 400), 14);
        Assert.Equal(1.5, PoissonRatio.Ratio(3.0 / 7, 200, 400), 12);
    }
}
