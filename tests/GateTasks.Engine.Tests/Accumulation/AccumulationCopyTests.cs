using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Histograms;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>
/// A feature given the same values as an earlier one takes copies of its histogram and moments (a category block's
/// fractions over one 'by'). The program compared with itself: a copy, and the copy after more batches, must hold the
/// state of an accumulation that was given every value itself, to the bit, and must not share state with its source.
/// </summary>
public class AccumulationCopyTests
{
    private static (double[] Values, double[] Weights) Batch(int seed, int length)
    {
        var rng = new Xoshiro256StarStar(seed);
        var values = Enumerable.Range(0, length).Select(_ => Math.Floor(5 * rng.NextDouble()) - 1 + 1e-3 * rng.NextDouble()).ToArray();
        values[length / 3] = double.NaN;
        values[length / 2] = double.PositiveInfinity;
        return (values, Enumerable.Range(0, length).Select(_ => 0.25 + rng.NextDouble()).ToArray());
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Copied_moments_go_on_as_those_given_every_value(bool weighted)
    {
        var (first, w1) = Batch(1, 1_001);
        var (second, w2) = Batch(2, 997);
        var source = new FeatureStatistics();
        var alone = new FeatureStatistics();
        source.Add(first, weighted ? w1 : []);
        alone.Add(first, weighted ? w1 : []);
        var copy = source.Copy();
        Assert.Equal(alone.State(), copy.State());
        copy.Add(second, weighted ? w2 : []);
        alone.Add(second, weighted ? w2 : []);
        Assert.Equal(alone.State(), copy.State());
        Assert.Equal(alone.Summary(), copy.Summary());
        // The source did not see the second batch.
        Assert.NotEqual(alone.State(), source.State());
    }

    [Fact]
    public void A_copied_histogram_goes_on_as_one_given_every_value()
    {
        var edges = new[] { -1.0, 0, 1, 2, 3 };
        var (first, w1) = Batch(3, 2_003);
        var (second, w2) = Batch(4, 1_999);
        var source = new ExactHistogram(new VariableAxis(edges));
        var alone = new ExactHistogram(new VariableAxis(edges));
        var firstOnly = new ExactHistogram(new VariableAxis(edges));
        var batch = new Histogram(new VariableAxis(edges));
        foreach (var h in new[] { source, alone, firstOnly })
        {
            batch.Fill(first, w1);
            h.Absorb(batch);
        }
        var copy = source.CopyOn(new VariableAxis(edges));
        foreach (var h in new[] { copy, alone })
        {
            batch.Fill(second, w2);
            h.Absorb(batch);
        }
        AssertSameState(alone.State(), copy.State());
        // The source did not see the second batch.
        AssertSameState(firstOnly.State(), source.State());
        Assert.Throws<ArgumentException>(() => source.CopyOn(new VariableAxis([-1.0, 0, 1, 2, 4])));
    }

    private static void AssertSameState(ExactHistogramState expected, ExactHistogramState actual)
    {
        Assert.Equal((expected.Entries, expected.NanEntries), (actual.Entries, actual.NanEntries));
        Assert.Equal(expected.NanW, actual.NanW);
        Assert.Equal(expected.NanW2, actual.NanW2);
        Assert.Equal(expected.Cells.SumW.Count, actual.Cells.SumW.Count);
        for (var c = 0; c < expected.Cells.SumW.Count; c++)
        {
            Assert.Equal(expected.Cells.SumW[c], actual.Cells.SumW[c]);
            Assert.Equal(expected.Cells.SumW2[c], actual.Cells.SumW2[c]);
        }
    }
}
