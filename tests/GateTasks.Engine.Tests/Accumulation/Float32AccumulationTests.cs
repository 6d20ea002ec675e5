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
    [Theory]
    [InlineData(-1.2345678901234567, 2.718281828459045)] // thresholds between two floats
    [InlineData(-1.5, 2.25)] // thresholds that are floats
    [InlineData(-1e300, 1e300)] // beyond the float range
    [InlineData(3.0000001, -0.1)] // low above high: a value below both is counted below only
    public void Far_tail_counts_of_float_values_are_those_of_the_same_values_as_doubles(double low, double high)
    {
        var rng = new Xoshiro256StarStar(17);
        var values = new List<float>();
        // Every float next to each threshold and to its float roundings, then random values, NaN and infinities.
        foreach (var t in new[] { low, high })
        {
            var f = (float)t;
            var x = MathF.BitDecrement(MathF.BitDecrement(f));
            for (var k = 0; k < 5; k++, x = MathF.BitIncrement(x)) values.Add(x);
        }
        values.AddRange(Enumerable.Range(0, 1_000).Select(_ => (float)(8 * rng.NextDouble() - 4)));
        values.AddRange([float.NaN, float.PositiveInfinity, float.NegativeInfinity, float.MaxValue, -float.MaxValue, float.NaN]);
        var floats = values.ToArray();
        var doubles = floats.Select(f => (double)f).ToArray();
        var asFloats = new FarTailCounter(low, high);
        var asDoubles = new FarTailCounter(low, high);
        foreach (var length in new[] { floats.Length, 7, 0, floats.Length - 3 }) // lengths with and without a tail
        {
            asFloats.Add(floats.AsSpan(0, length));
            asDoubles.Add(doubles.AsSpan(0, length), ReadOnlySpan<double>.Empty);
        }
        Assert.Equal(asDoubles.Counts, asFloats.Counts);
        Assert.Equal(asDoubles.State().SelectMany(t => t), asFloats.State().SelectMany(t => t));
        Assert.True(asDoubles.Counts.BelowW > 0 && asDoubles.Counts.AboveW > 0); // both tails are reached
    }
}

/// <summary>
/// The fine grid of quantile and distance checks filled with float32 values against the same values widened to
/// doubles: the program compared with itself (the cells were searched by the guide table before; the float path counts
/// edges in two levels and keeps integer counts until read). Cells, tail moments and the exact state must agree to the bit.
/// </summary>
public class Float32FineGridTests
{
    [Theory]
    [InlineData(65_536, false)]
    [InlineData(1_003, true)] // NaN and infinities, left out by both paths
    public void A_fine_grid_filled_with_floats_holds_the_cells_and_tails_of_the_same_values_as_doubles(int length, bool specials)
    {
        var rng = new Xoshiro256StarStar(length);
        double Draw() => Math.Exp(3 + 0.6 * Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble()));
        var sorted = Enumerable.Range(0, 50_000).Select(_ => Draw()).Order().ToArray();
        // Edges inside the values' range, so that both tails hold values and their moments are summed.
        var edges = Enumerable.Range(0, 4_097).Select(k => sorted[500 + k * 49_000 / 4_096] + k * 1e-9).ToArray();
        var floats = Enumerable.Range(0, length).Select(_ => (float)Draw()).ToArray();
        if (specials)
        {
            floats[1] = float.NaN;
            floats[length - 1] = float.PositiveInfinity;
            floats[length / 2] = float.NegativeInfinity;
        }
        var doubles = floats.Select(f => (double)f).ToArray();
        var fromFloats = new FineGridCounter(edges);
        var fromDoubles = new FineGridCounter(edges);
        for (var batch = 0; batch < 3; batch++)
        {
            fromFloats.Add(floats);
            fromDoubles.Add(doubles, ReadOnlySpan<double>.Empty);
        }
        var f = fromFloats.Finish();
        var d = fromDoubles.Finish();
        Assert.Equal(d.SumW, f.SumW);
        Assert.Equal(d.SumW2, f.SumW2);
        Assert.True(d.BelowMoment > 0 && d.AboveMoment > 0, "both tails hold values");
        Assert.Equal((d.BelowMoment, d.BelowMoment2, d.AboveMoment, d.AboveMoment2), (f.BelowMoment, f.BelowMoment2, f.AboveMoment, f.AboveMoment2));

        // Shards: floats in one, doubles and floats in another, merged through their states, give the one pass's bits.
        var first = new FineGridCounter(edges);
        first.Add(floats);
        var second = new FineGridCounter(edges);
        second.Add(doubles, ReadOnlySpan<double>.Empty);
        second.Add(floats);
        var merged = new FineGridCounter(edges);
        Assert.True(merged.AddState(first.State()));
        merged.Merge(second);
        var m = merged.Finish();
        Assert.Equal(d.SumW, m.SumW);
        Assert.Equal((d.BelowMoment, d.BelowMoment2, d.AboveMoment, d.AboveMoment2), (m.BelowMoment, m.BelowMoment2, m.AboveMoment, m.AboveMoment2));
    }
}
