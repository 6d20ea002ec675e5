using System.Text.Json;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

public class WeightedCorrelationTests
{
    private static readonly JsonElement VarianceCases =
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "scipy", "correlation_variance.json")))
            .RootElement.GetProperty("cases");

    private static double[] Numbers(JsonElement c, string name) => c.GetProperty(name).EnumerateArray().Select(v => v.GetDouble()).ToArray();

    private static JsonElement Case(string name) => VarianceCases.EnumerateArray().Single(c => c.GetProperty("name").GetString() == name);

    private static WeightedCorrelation Fill(JsonElement c)
    {
        var x = Numbers(c, "x");
        var y = Numbers(c, "y");
        var w = c.TryGetProperty("w", out _) ? Numbers(c, "w") : null;
        var acc = new WeightedCorrelation();
        for (var i = 0; i < x.Length; i++) acc.Add(x[i], y[i], w?[i] ?? 1.0);
        return acc;
    }

    [Fact]
    public void Pearson_matches_scipy()
    {
        // scipy 1.10.1 (Debian bookworm python3-scipy): stats.pearsonr(x, y)[0] = 0.9616466413942146 for these data.
        double[] x = [1.2, 2.3, 2.9, 4.1, 5.5, 6.0, 7.4, 8.8], y = [2.0, 1.9, 3.5, 3.9, 6.1, 5.2, 8.0, 7.7];
        var c = new WeightedCorrelation();
        for (var i = 0; i < x.Length; i++) c.Add(x[i], y[i]);
        Assert.Equal(0.9616466413942146, c.Pearson, 12);
    }

    [Fact]
    public void Integer_weights_equal_repeated_events()
    {
        // A weight of k is k copies of the event (definition of a frequency weight).
        var weighted = new WeightedCorrelation();
        var repeated = new WeightedCorrelation();
        double[] x = [1, 2, 3, 4], y = [1, 3, 2, 5];
        int[] w = [1, 3, 2, 1];
        for (var i = 0; i < x.Length; i++)
        {
            weighted.Add(x[i], y[i], w[i]);
            for (var k = 0; k < w[i]; k++) repeated.Add(x[i], y[i]);
        }
        Assert.Equal(repeated.Pearson, weighted.Pearson, 12);
        Assert.Equal(repeated.AsymptoticVariance, weighted.AsymptoticVariance, 12);
    }

    [Theory]
    [InlineData("lognormal_energy_response")]
    [InlineData("bivariate_normal_0.6")]
    [InlineData("weighted_lognormal")]
    [InlineData("signed_weights")]
    public void Asymptotic_variance_matches_numpy(string name)
    {
        var c = Case(name);
        var acc = Fill(c);
        // numpy 1.24.2: n·Var(r) as numpy.average((zx*zy - r/2*(zx**2 + zy**2))**2, weights=w), the influence-function
        // form, evaluated independently of the streamed fourth moments (tests/fixtures/scipy/correlation_variance.json).
        Assert.Equal(c.GetProperty("pearson").GetDouble(), acc.Pearson, 10);
        Assert.Equal(c.GetProperty("n_var").GetDouble(), acc.AsymptoticVariance, 1e-9 * c.GetProperty("n_var").GetDouble());
    }

    [Theory]
    [InlineData("lognormal_energy_response")]
    [InlineData("bivariate_normal_0.6")]
    public void Standard_error_agrees_with_scipy_bootstrap(string name)
    {
        var c = Case(name);
        var acc = Fill(c);
        var se = WeightedCorrelation.StandardError(acc.AsymptoticVariance, acc.EffectiveCount);
        // scipy 1.10.1: scipy.stats.bootstrap((x, y), pearson, paired=True, n_resamples=4000, method='percentile',
        // random_state=default_rng(7)).standard_error; 4000 resamples of n = 3000 leave a few percent of noise.
        Assert.InRange(se / c.GetProperty("bootstrap_se").GetDouble(), 0.93, 1.07);
    }

    [Fact]
    public void Heavy_tails_widen_the_error_well_beyond_the_normal_law()
    {
        // The same fixture: the bootstrap standard error is about 4× the bivariate-normal (1 − r²)/√(n − 3) (scipy 1.10.1).
        var c = Case("lognormal_energy_response");
        var acc = Fill(c);
        Assert.True(WeightedCorrelation.StandardError(acc.AsymptoticVariance, acc.EffectiveCount) > 3 * c.GetProperty("normal_se").GetDouble());
    }

    [Fact]
    public void Normal_law_gives_fishers_large_sample_form()
    {
        // For a bivariate normal μ40 = μ04 = 3, μ22 = 1 + 2ρ², μ31 = μ13 = 3ρ, and the fourth-moment form reduces to
        // (1 − ρ²)² [textbook identity, Anderson 2003 §4.2.3]; the fixture's normal case is within sampling noise of it.
        var c = Case("bivariate_normal_0.6");
        var acc = Fill(c);
        var r = acc.Pearson;
        Assert.InRange(acc.AsymptoticVariance / ((1 - r * r) * (1 - r * r)), 0.9, 1.1);
        // √(n·Var / n_eff): r = 0.5 under the normal law gives n·Var = 0.75² = 0.5625, over 100 events 0.075 [hand-computed].
        Assert.Equal(0.075, WeightedCorrelation.StandardError(0.5625, 100), 12);
    }

    [Fact]
    public void Merged_shards_equal_one_pass()
    {
        // Compares the program with itself: shards merged pairwise against one streamed pass, to rounding.
        var c = Case("weighted_lognormal");
        var x = Numbers(c, "x");
        var y = Numbers(c, "y");
        var w = Numbers(c, "w");
        var one = Fill(c);
        var parts = new[] { new WeightedCorrelation(), new WeightedCorrelation(), new WeightedCorrelation() };
        for (var i = 0; i < x.Length; i++) parts[i < 37 ? 0 : i < 250 ? 1 : 2].Add(x[i], y[i], w[i]);
        var restored = new WeightedCorrelation();
        Assert.True(restored.Restore(parts[1].State()));
        parts[0].Merge(restored);
        parts[0].Merge(parts[2]);
        Assert.Equal(one.Count, parts[0].Count);
        Assert.Equal(one.Pearson, parts[0].Pearson, 12);
        Assert.Equal(one.AsymptoticVariance, parts[0].AsymptoticVariance, 1e-10 * one.AsymptoticVariance);
        Assert.Equal(one.EffectiveCount, parts[0].EffectiveCount, 9);
        Assert.False(new WeightedCorrelation().Restore(new double[8])); // the eight numbers of an older partial
    }

    [Fact]
    public void Signed_weights_whose_running_sum_passes_through_zero_match_numpy_in_batches_too()
    {
        // numpy 1.24.2, fixture case "signed_weights": weights ±1, the first two +1 then −1 (Σw is 0 after two events;
        // the moment update divided by it before). Streamed pair by pair above; here in batches whose first one cancels.
        var c = Case("signed_weights");
        var x = Numbers(c, "x");
        var y = Numbers(c, "y");
        var w = Numbers(c, "w");
        var acc = new WeightedCorrelation();
        acc.AddBatch(x.AsSpan(0, 2), y.AsSpan(0, 2), w.AsSpan(0, 2));
        Assert.True(double.IsNaN(acc.Pearson)); // all weight cancelled: undefined, not a number made up
        acc.AddBatch(x.AsSpan(2, 98), y.AsSpan(2, 98), w.AsSpan(2, 98));
        acc.AddBatch(x.AsSpan(100), y.AsSpan(100), w.AsSpan(100));
        Assert.Equal(c.GetProperty("pearson").GetDouble(), acc.Pearson, 10);
        Assert.Equal(c.GetProperty("n_var").GetDouble(), acc.AsymptoticVariance, 1e-9 * c.GetProperty("n_var").GetDouble());
        // Compares the program with itself: the same events as two shards whose weights cancel separately.
        var a = new WeightedCorrelation();
        var b = new WeightedCorrelation();
        a.Add(x[0], y[0], w[0]);
        b.Add(x[1], y[1], w[1]);
        b.Merge(a);
        for (var i = 2; i < x.Length; i++) b.Add(x[i], y[i], w[i]);
        Assert.Equal(acc.Pearson, b.Pearson, 12);
    }
}
