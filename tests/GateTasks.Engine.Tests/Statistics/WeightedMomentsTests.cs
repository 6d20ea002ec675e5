using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class WeightedMomentsTests
{
    [Theory]
    // Kish 1965 effective sample size (Σw)²/Σw² [published]
    [InlineData(new double[] { 1, 1, 1, 1 }, 4.0)]
    [InlineData(new double[] { 1, 2, 3, 4 }, 10.0 / 3)]
    [InlineData(new[] { 0.5, 0.5, 1, 2 }, 32.0 / 11)]
    [InlineData(new double[] { 1, 1, 1, 1, 10 }, 196.0 / 104)]
    public void KishEffectiveCount(double[] weights, double expected)
    {
        var acc = new WeightedMoments();
        foreach (double w in weights) acc.Add(1.0, w);
        Near(expected, acc.EffectiveCount, 1e-15);
    }

    [Theory]
    [InlineData("weighted_1000")]
    [InlineData("large_offset_500")]
    public void MeanAndVarianceMatchNumpy(string name)
    {
        // numpy 1.24.2 average(x, weights=w) and average((x-mean)**2, weights=w), fixture weighted_moments/<name>
        var c = Case("weighted_moments", name);
        double[] x = c.Doubles("x"), w = c.Doubles("w");
        var acc = new WeightedMoments();
        for (int i = 0; i < x.Length; i++) acc.Add(x[i], w[i]);
        Near(c.Double("mean"), acc.Mean, 1e-13);
        Near(c.Double("variance"), acc.Variance, 1e-9);
        Near(Math.Sqrt(c.Double("variance")), acc.StandardDeviation, 1e-9);
        Near(c.Double("effective_count"), acc.EffectiveCount, 1e-12);
        Assert.Equal(x.Length, acc.Count);
    }

    [Fact]
    public void MergedPartsMatchNumpy()
    {
        // numpy 1.24.2 values of the whole sample, fixture weighted_moments/weighted_1000; accumulated in three parts.
        var c = Case("weighted_moments", "weighted_1000");
        double[] x = c.Doubles("x"), w = c.Doubles("w");
        var parts = new[] { new WeightedMoments(), new WeightedMoments(), new WeightedMoments() };
        for (int i = 0; i < x.Length; i++) parts[i < 100 ? 0 : i < 700 ? 1 : 2].Add(x[i], w[i]);
        var total = new WeightedMoments();
        foreach (var p in parts) total.Merge(p);
        Near(c.Double("mean"), total.Mean, 1e-13);
        Near(c.Double("variance"), total.Variance, 1e-9);
        Near(c.Double("effective_count"), total.EffectiveCount, 1e-12);
        Assert.Equal(x.Length, total.Count);
    }

    [Fact]
    public void RunningSumOfWeightsThroughZeroLosesNothing()
    {
        // Two −0.5 events before a +1 bring Σw to zero on the way; the whole sample's moments are still defined.
        // numpy 1.24.2: average(x, weights=w) = 1.2375000000000003, average((x − mean)², weights=w) = 0.4423437500000001.
        double[] x = [1.2, 1.3, 1.0, 1.6, 0.5, 2.2, 0.9], w = [-0.5, -0.5, 1, 1, 1, 1, 1];
        var acc = new WeightedMoments();
        for (int i = 0; i < x.Length; i++) acc.Add(x[i], w[i]);
        Near(1.2375000000000003, acc.Mean, 1e-13);
        Near(0.4423437500000001, acc.Variance, 1e-12);
    }

    [Fact]
    public void EmptyAccumulatorHasNoMean()
    {
        var acc = new WeightedMoments();
        Assert.True(double.IsNaN(acc.Mean));
        Assert.Equal(0.0, acc.EffectiveCount);
    }
}
