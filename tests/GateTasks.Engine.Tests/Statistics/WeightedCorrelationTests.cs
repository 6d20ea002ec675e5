using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

public class WeightedCorrelationTests
{
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
    }

    [Fact]
    public void Standard_error_is_fishers_large_sample_form()
    {
        // (1 − r²)/√(n − 3): r = 0.5, n = 103 → 0.75/10 = 0.075 [exact, hand-computed].
        Assert.Equal(0.075, WeightedCorrelation.StandardError(0.5, 103, spearman: false), 12);
        Assert.Equal(0.075 * Math.Sqrt(1.06), WeightedCorrelation.StandardError(0.5, 103, spearman: true), 12);
    }
}
