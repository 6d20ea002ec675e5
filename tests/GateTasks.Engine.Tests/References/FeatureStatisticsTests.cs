using GateTasks.Engine.References;
using MathNet.Numerics.Random;
using MathNet.Numerics.Statistics;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Tests.References;

/// <summary>
/// A feature's moments gathered batch by batch (unit weights take the two-pass batch update) against MathNet.Numerics'
/// own population statistics over all values at once, an independent general-purpose implementation.
/// </summary>
public class FeatureStatisticsTests
{
    [Fact]
    public void Batched_unit_weight_moments_match_MathNet_over_the_whole_sample()
    {
        var rng = new Xoshiro256StarStar(17);
        // Offset far from zero, so a naive Σx² would lose digits; NaN sprinkled in and counted apart.
        var values = Enumerable.Range(0, 200_000).Select(i => i % 1000 == 7 ? double.NaN : 1e4 + Math.Pow(rng.NextDouble(), 3) * 50).ToArray();
        var finite = values.Where(v => !double.IsNaN(v)).ToArray();
        var stats = new FeatureStatistics();
        for (var start = 0; start < values.Length; start += 65_536)
            stats.Add(values.AsSpan(start, Math.Min(65_536, values.Length - start)), []);
        var s = stats.Summary();

        Assert.Equal(finite.Length, s.Count);
        Assert.Equal(values.Length - finite.Length, s.NanCount);
        Assert.Equal(finite.Min(), s.Min);
        Assert.Equal(finite.Max(), s.Max);
        // MathNet.Numerics 5: ArrayStatistics.Mean, PopulationStandardDeviation, PopulationKurtosis (excess, so + 3).
        Assert.Equal(ArrayStatistics.Mean(finite), s.Mean, 1e-9);
        Assert.Equal(ArrayStatistics.PopulationStandardDeviation(finite), s.StandardDeviation, 1e-9);
        Assert.Equal(MathNet.Numerics.Statistics.Statistics.PopulationKurtosis(finite) + 3, s.Kurtosis, 1e-6);
    }

    [Fact]
    public void Unit_weights_given_as_ones_and_left_out_agree()
    {
        var rng = new Xoshiro256StarStar(5);
        var values = Enumerable.Range(0, 10_000).Select(_ => rng.NextDouble() * 10 - 3).ToArray();
        var implicitOnes = new FeatureStatistics();
        var explicitOnes = new FeatureStatistics();
        implicitOnes.Add(values, []);
        explicitOnes.Add(values, Enumerable.Repeat(1.0, values.Length).ToArray());
        var (a, b) = (implicitOnes.Summary(), explicitOnes.Summary());
        Assert.Equal(b.Count, a.Count);
        Assert.Equal(b.SumW, a.SumW);
        Assert.Equal(b.Mean, a.Mean, 1e-12);
        Assert.Equal(b.StandardDeviation, a.StandardDeviation, 1e-12);
        Assert.Equal(b.Kurtosis, a.Kurtosis, 1e-10);
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Infinities_and_NaN_are_counted_and_kept_out_of_the_moments(bool weighted)
    {
        // Ten finite values 1..10 (mean 5.5, population σ² = 8.25: arithmetic) among NaN and ±∞, past a SIMD width.
        double[] values = [1, double.PositiveInfinity, 2, 3, double.NaN, 4, 5, double.NegativeInfinity, 6, 7, 8, double.PositiveInfinity, 9, 10];
        var stats = new FeatureStatistics();
        stats.Add(values, weighted ? Enumerable.Repeat(1.0, values.Length).ToArray() : []);
        var s = stats.Summary();
        Assert.Equal(10, s.Count);
        Assert.Equal(1, s.NanCount);
        Assert.Equal(2, s.PositiveInfinityCount);
        Assert.Equal(1, s.NegativeInfinityCount);
        Assert.Equal(4, s.NonFiniteCount);
        Assert.Equal(1, s.Min);
        Assert.Equal(10, s.Max);
        Assert.Equal(5.5, s.Mean, 12);
        Assert.Equal(Math.Sqrt(8.25), s.StandardDeviation, 12);
    }
}
