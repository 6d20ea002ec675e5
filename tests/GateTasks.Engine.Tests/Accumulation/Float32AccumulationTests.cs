using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Histograms;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>
/// Float32 values handed on as stored (no conversion) against the same values converted to doubles: the program
/// compared with itself. Widening a float to a double is exact, so the cells and every sum must agree to the bit.
/// </summary>
public class Float32AccumulationTests
{
    [Theory]
    [InlineData(65_536, false)]
    [InlineData(1_003, true)] // a length that leaves a tail after the SIMD lanes, with NaN and infinities
    [InlineData(1_005, true)] // eight at a time, then four through the block
    [InlineData(3, true)]
    public void Moments_of_float_values_are_those_of_the_same_values_as_doubles(int length, bool specials)
    {
        var rng = new Xoshiro256StarStar(length);
        var floats = Enumerable.Range(0, length).Select(_ => (float)(Math.Exp(3 * rng.NextDouble()) - 7)).ToArray();
        if (specials)
        {
            floats[1] = float.NaN;
            floats[length - 1] = float.PositiveInfinity;
            floats[length / 2] = float.NegativeInfinity;
        }
        var doubles = floats.Select(f => (double)f).ToArray();
        var asFloats = new FeatureStatistics();
        var asDoubles = new FeatureStatistics();
        for (var batch = 0; batch < 3; batch++) // the running state carries from batch to batch
        {
            asFloats.Add(floats);
            asDoubles.Add(doubles, ReadOnlySpan<double>.Empty);
        }
        Assert.Equal(asDoubles.State(), asFloats.State());
    }

    [Theory]
    [InlineData(40)]
    [InlineData(100)]
    public void A_histogram_filled_with_floats_holds_the_cells_of_the_same_values_as_doubles(int bins)
    {
        var rng = new Xoshiro256StarStar(bins);
        var floats = Enumerable.Range(0, 10_007).Select(_ => (float)Math.Tan(Math.PI * (rng.NextDouble() - 0.5))).ToArray();
        floats[5] = float.NaN;
        var sorted = floats.Where(f => !float.IsNaN(f)).Select(f => (double)f).Order().ToArray();
        var edges = Enumerable.Range(0, bins + 1).Select(k => sorted[k * (sorted.Length - 1) / bins] + 1e-9).ToArray();
        var axis = new VariableAxis(edges);
        var fromFloats = new Histogram(axis);
        var fromDoubles = new Histogram(axis);
        fromFloats.Fill(floats);
        fromDoubles.Fill(floats.Select(f => (double)f).ToArray(), ReadOnlySpan<double>.Empty);
        Assert.Equal(fromDoubles.SumW.ToArray(), fromFloats.SumW.ToArray());
        Assert.Equal(fromDoubles.SumW2.ToArray(), fromFloats.SumW2.ToArray());
        Assert.Equal((fromDoubles.Entries, fromDoubles.NanEntries), (fromFloats.Entries, fromFloats.NanEntries));
    }
}
