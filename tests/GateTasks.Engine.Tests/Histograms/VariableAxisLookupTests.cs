using GateTasks.Engine.Histograms;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Histograms;

public class VariableAxisLookupTests
{
    /// <summary>The textbook answer: the last edge at or below the value (half-open bins), flows at the ends.</summary>
    private static int Reference(double[] edges, double x)
    {
        if (x < edges[0]) return -1;
        if (x >= edges[^1]) return edges.Length - 1;
        var i = Array.BinarySearch(edges, x);
        return i >= 0 ? i : ~i - 1;
    }

    [Theory]
    [InlineData(3, 1)]
    [InlineData(40, 2)]
    [InlineData(200, 3)]
    public void The_guide_table_gives_the_binary_search_answer_everywhere(int bins, int seed)
    {
        var rng = new Xoshiro256StarStar(seed);
        // Equal-probability edges of a heavy-tailed law (widths spanning many orders of magnitude), as quantile binning makes.
        var edges = Enumerable.Range(0, bins + 1).Select(i => Math.Pow(1e6, (double)i / bins) - 1 + i * 1e-9).ToArray();
        var axis = new VariableAxis(edges);
        var probes = new List<double>();
        foreach (var e in edges) probes.AddRange([e, Math.BitDecrement(e), Math.BitIncrement(e)]);
        for (var k = 0; k < 200_000; k++) probes.Add(-1 + rng.NextDouble() * 1.1e6);
        for (var k = 0; k < 200_000; k++) probes.Add(Math.Pow(10, rng.NextDouble() * 6) - 1);
        foreach (var x in probes) Assert.True(Reference(edges, x) == axis.Index(x), $"x = {x:R}");
    }

    [Fact]
    public void Many_narrow_bins_inside_one_guide_bucket_still_give_the_binary_search_answer()
    {
        // 300 bins of width 1e-7 packed next to zero, then 20 unit bins: the guide buckets (8 per bin over the whole
        // range) each hold dozens of the narrow bins, so the lookup's short walk gives way to its binary search.
        var edges = Enumerable.Range(0, 301).Select(i => i * 1e-7).Concat(Enumerable.Range(1, 20).Select(i => (double)i)).ToArray();
        var axis = new VariableAxis(edges);
        var rng = new Xoshiro256StarStar(4);
        var probes = new List<double>();
        foreach (var e in edges) probes.AddRange([e, Math.BitDecrement(e), Math.BitIncrement(e)]);
        for (var k = 0; k < 100_000; k++) probes.Add(rng.NextDouble() * 3.1e-5 - 1e-6);
        for (var k = 0; k < 100_000; k++) probes.Add(rng.NextDouble() * 21 - 0.5);
        foreach (var x in probes) Assert.True(Reference(edges, x) == axis.Index(x), $"x = {x:R}");
    }
}
