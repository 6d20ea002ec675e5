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

    [Theory]
    [InlineData(40, -4.0, 4.0)]
    [InlineData(50, 25.0, 125.0)]
    [InlineData(7, -0.3, 1e-3)]
    [InlineData(1000, 0.0, 0.1)]
    [InlineData(65_536, -8e307, 8e307)] // (upper − lower)·count overflows: edges are computed dividing first
    public void A_regular_axis_bins_a_block_where_a_binary_search_over_its_edges_does(int bins, double lower, double upper)
    {
        // The block-wise (vectorised where the processor allows) cells against the textbook placement over the
        // axis's own stored edges, at every edge and its neighbours and at random points, flows and NaN included.
        var axis = new RegularAxis(bins, lower, upper);
        var edges = axis.Edges.ToArray();
        var rng = new Xoshiro256StarStar(bins);
        var probes = new List<double>();
        foreach (var e in edges) probes.AddRange([e, Math.BitDecrement(e), Math.BitIncrement(e)]);
        var span = upper - lower;
        for (var k = 0; k < 100_000; k++) probes.Add(lower - 0.01 * span + rng.NextDouble() * 1.02 * span);
        probes.AddRange([double.NaN, double.PositiveInfinity, double.NegativeInfinity]);
        var cells = new int[probes.Count];
        axis.Cells(probes.ToArray(), cells, edges.Length + 1);
        for (var i = 0; i < probes.Count; i++)
        {
            var expected = double.IsNaN(probes[i]) ? edges.Length + 1 : Reference(edges, probes[i]) + 1;
            Assert.True(expected == cells[i], $"x = {probes[i]:R}: cell {cells[i]}, expected {expected}");
        }
    }

    [Fact]
    public void A_variable_axis_bins_a_block_as_it_bins_each_value()
    {
        var edges = Enumerable.Range(0, 41).Select(i => Math.Pow(1e3, i / 40.0) - 1 + i * 1e-9).ToArray();
        var axis = new VariableAxis(edges);
        var rng = new Xoshiro256StarStar(8);
        var probes = edges.SelectMany(e => new[] { e, Math.BitDecrement(e), Math.BitIncrement(e) })
            .Concat(Enumerable.Range(0, 50_000).Select(_ => rng.NextDouble() * 1.1e3 - 5))
            .Append(double.NaN).ToArray();
        var cells = new int[probes.Length];
        axis.Cells(probes, cells, edges.Length + 1);
        for (var i = 0; i < probes.Length; i++)
        {
            var expected = double.IsNaN(probes[i]) ? edges.Length + 1 : Reference(edges, probes[i]) + 1;
            Assert.True(expected == cells[i], $"x = {probes[i]:R}: cell {cells[i]}, expected {expected}");
        }
    }
    [Theory]
    [InlineData(1)]
    [InlineData(40)]
    [InlineData(63)] // the most edges the counting search takes
    [InlineData(64)] // one more: the guide table's search
    public void Counting_edges_in_SIMD_lanes_gives_the_binary_search_cell_for_every_lane(int bins)
    {
        // The textbook placement (Array.BinarySearch over the edges) against the block-wise cells, with NaN, ±∞, ±0
        // and values on, just below and just above every edge put in every lane position of a register, and edges of
        // a long-tailed law (the case where the guide table falls back on its binary search).
        var edges = Enumerable.Range(0, bins + 1).Select(i => Math.Sinh(12.0 * i / bins - 6) * 1e3).ToArray();
        var axis = new VariableAxis(edges);
        var rng = new Xoshiro256StarStar(bins + 100);
        var specials = new[] { double.NaN, double.PositiveInfinity, double.NegativeInfinity, 0.0, -0.0, double.MaxValue, -double.MaxValue, double.Epsilon };
        var probes = new List<double>();
        foreach (var e in edges) probes.AddRange([e, Math.BitDecrement(e), Math.BitIncrement(e)]);
        for (var lane = 0; lane < 17; lane++)
            foreach (var special in specials)
            {
                for (var k = 0; k < lane; k++) probes.Add(edges[rng.Next(edges.Length)]);
                probes.Add(special);
            }
        for (var k = 0; k < 20_000; k++) probes.Add(Math.Sinh(rng.NextDouble() * 14 - 7) * 1e3);
        var cells = new int[probes.Count];
        var nanCell = edges.Length + 1;
        axis.Cells(probes.ToArray(), cells, nanCell);
        for (var i = 0; i < probes.Count; i++)
        {
            var expected = double.IsNaN(probes[i]) ? nanCell : Reference(edges, probes[i]) + 1;
            Assert.True(expected == cells[i], $"value {i}, x = {probes[i]:R}: cell {cells[i]}, expected {expected}");
        }
    }
    [Theory]
    [InlineData("variable", 40)]
    [InlineData("variable", 100)] // more edges than the counting search takes: the guide table
    [InlineData("regular", 50)]
    public void Float32_values_get_the_cells_of_the_same_values_as_doubles(string kind, int bins)
    {
        // The textbook placement of each float widened to a double (Array.BinarySearch over the axis's double edges)
        // against the float block: probes are the floats nearest every edge (each edge is rarely a float itself), and
        // their neighbours, specials in every lane position, and random floats.
        var edges = kind == "regular"
            ? new RegularAxis(bins, -2.5, 2.5).Edges.ToArray()
            : Enumerable.Range(0, bins + 1).Select(i => Math.Sinh(12.0 * i / bins - 6) * 1e3 + 1e-7 * i).ToArray();
        var axis = kind == "regular" ? (Axis)new RegularAxis(bins, -2.5, 2.5) : new VariableAxis(edges);
        var rng = new Xoshiro256StarStar(bins + 7);
        var probes = new List<float>();
        foreach (var e in edges)
        {
            var f = (float)e;
            probes.AddRange([f, MathF.BitDecrement(f), MathF.BitIncrement(f), MathF.BitDecrement(MathF.BitDecrement(f))]);
        }
        var specials = new[] { float.NaN, float.PositiveInfinity, float.NegativeInfinity, 0f, -0f, float.MaxValue, -float.MaxValue };
        for (var lane = 0; lane < 33; lane++)
            foreach (var special in specials)
            {
                for (var k = 0; k < lane; k++) probes.Add((float)edges[rng.Next(edges.Length)]);
                probes.Add(special);
            }
        for (var k = 0; k < 20_000; k++) probes.Add((float)(kind == "regular" ? rng.NextDouble() * 6 - 3 : Math.Sinh(rng.NextDouble() * 14 - 7) * 1e3));
        var cells = new int[probes.Count];
        var nanCell = edges.Length + 1;
        axis.Cells(probes.ToArray(), cells, nanCell);
        for (var i = 0; i < probes.Count; i++)
        {
            var expected = float.IsNaN(probes[i]) ? nanCell : Reference(edges, probes[i]) + 1;
            Assert.True(expected == cells[i], $"value {i}, x = {probes[i]:R}: cell {cells[i]}, expected {expected}");
        }
    }
}
