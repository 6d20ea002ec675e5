using System.Text.Json;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Tests.Histograms;

/// <summary>
/// One search over the union of a feature's histogram edges and its fine-grid edges, against numpy's placement on
/// each axis alone: numpy.searchsorted(edges, values as float64, side="right") and numpy.bincount of those cells, with
/// Debian's numpy 1.24 on Python 3.11, frozen into tests/fixtures/numpy/union_cells.json by
/// tests/fixtures/numpy/make_union_cells_fixtures.py (a log-normal fine grid with a quantile histogram reaching past it
/// and sharing five edges, a normal fine grid inside a regular histogram, and edges of both axes closer than a float32
/// step), each edge probed at its float32 value and both float32 neighbours.
/// </summary>
public class UnionEdgeSearchTests
{
    public static TheoryData<string> Cases() => new(Fixture().RootElement.GetProperty("cases").EnumerateArray().Select(c => c.GetProperty("name").GetString()!));

    private static JsonDocument Fixture() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "numpy", "union_cells.json")));

    private sealed record Case(double[] Coarse, double[] Fine, float[] Values, int[] CoarseCells, int[] FineCells, long[] CoarseCounts, long[] FineCounts);

    private static Case Load(string name)
    {
        var c = Fixture().RootElement.GetProperty("cases").EnumerateArray().Single(x => x.GetProperty("name").GetString() == name);
        double[] Doubles(string p) => c.GetProperty(p).EnumerateArray().Select(e => e.GetDouble()).ToArray();
        return new(Doubles("coarse_edges"), Doubles("fine_edges"),
            c.GetProperty("values").EnumerateArray().Select(e => (float)e.GetDouble()).ToArray(),
            c.GetProperty("coarse_cells").EnumerateArray().Select(e => e.GetInt32()).ToArray(),
            c.GetProperty("fine_cells").EnumerateArray().Select(e => e.GetInt32()).ToArray(),
            c.GetProperty("coarse_counts").EnumerateArray().Select(e => e.GetInt64()).ToArray(),
            c.GetProperty("fine_counts").EnumerateArray().Select(e => e.GetInt64()).ToArray());
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Each_axis_cell_is_where_numpy_searchsorted_places_the_value(string name)
    {
        if (!UnionEdgeSearch.IsSupported) return; // the search needs SIMD registers; callers search each axis alone then
        var c = Load(name);
        var search = new UnionEdgeSearch(c.Coarse, c.Fine);
        var cells = new int[c.Values.Length];
        foreach (var length in new[] { c.Values.Length, 512, 33, 7 })
        {
            Array.Fill(cells, -1);
            for (var start = 0; start < c.Values.Length; start += length)
            {
                var n = Math.Min(length, c.Values.Length - start);
                search.Cells(c.Values.AsSpan(start, n), cells.AsSpan(start, n));
            }
            for (var i = 0; i < c.Values.Length; i++)
            {
                Assert.True(c.CoarseCells[i] == search.FirstCells[cells[i]], $"{name}, blocks of {length}: x = {c.Values[i]:R}: histogram cell {search.FirstCells[cells[i]]}, numpy {c.CoarseCells[i]}");
                Assert.True(c.FineCells[i] == search.SecondCells[cells[i]], $"{name}, blocks of {length}: x = {c.Values[i]:R}: fine cell {search.SecondCells[cells[i]]}, numpy {c.FineCells[i]}");
            }
        }
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void One_search_counts_both_axes_as_numpy_bincount_does(string name)
    {
        var c = Load(name);
        var histogram = new Histogram(Axis.FromEdges(c.Coarse));
        var grid = new FineGridCounter(c.Fine);
        // In batches of unequal length, as a sample's row groups come.
        for (var start = 0; start < c.Values.Length; start += 5000)
        {
            var added = grid.Add(c.Values.AsSpan(start, Math.Min(5000, c.Values.Length - start)), histogram);
            Assert.Equal(UnionEdgeSearch.IsSupported, added);
            if (!added) return; // no SIMD search here: the caller fills each axis alone (BlockEdgeCountSearchTests)
        }
        Assert.Equal(c.CoarseCounts.Select(k => (double)k).ToArray(), histogram.SumW.ToArray());
        Assert.Equal(c.CoarseCounts.Select(k => (double)k).ToArray(), histogram.SumW2.ToArray());
        Assert.Equal(c.Values.Length, histogram.Entries);
        var fine = grid.Finish();
        Assert.Equal(c.FineCounts.Select(k => (double)k).ToArray(), fine.SumW);
        Assert.Equal(c.FineCounts.Select(k => (double)k).ToArray(), fine.SumW2);
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void One_search_gives_the_bits_of_filling_each_axis_alone(string name)
    {
        // The program against itself: the union search against the histogram's fill and the grid's own float path,
        // tail moments included (summed in the values' order both ways), over batches that reach the grid's tails.
        var c = Load(name);
        var (h1, h2) = (new Histogram(Axis.FromEdges(c.Coarse)), new Histogram(Axis.FromEdges(c.Coarse)));
        var (g1, g2) = (new FineGridCounter(c.Fine), new FineGridCounter(c.Fine));
        for (var start = 0; start < c.Values.Length; start += 3000)
        {
            var batch = c.Values.AsSpan(start, Math.Min(3000, c.Values.Length - start));
            if (!g1.Add(batch, h1)) return; // no SIMD search here
            h2.Fill(batch);
            g2.Add(batch);
        }
        Assert.Equal(h2.SumW.ToArray(), h1.SumW.ToArray());
        Assert.Equal(h2.Entries, h1.Entries);
        var (f1, f2) = (g1.Finish(), g2.Finish());
        Assert.Equal(f2.SumW, f1.SumW);
        Assert.True(f2.BelowMoment != 0 && f2.AboveMoment != 0, "the values reach both tails of the grid");
        Assert.Equal((f2.BelowMoment, f2.BelowMoment2, f2.AboveMoment, f2.AboveMoment2), (f1.BelowMoment, f1.BelowMoment2, f1.AboveMoment, f1.AboveMoment2));
    }

    [Fact]
    public void A_batch_with_a_value_that_is_not_finite_is_left_to_each_axis()
    {
        // By the fill's definition (NaN and ±∞ are counted apart, and a fine grid leaves them out): not from numpy.
        var histogram = new Histogram(Axis.FromEdges([0.0, 1.0, 2.0]));
        var grid = new FineGridCounter([0.0, 0.5, 1.0, 1.5, 2.0]);
        Assert.False(grid.Add([0.25f, float.NaN], histogram));
        Assert.False(grid.Add([0.25f, float.PositiveInfinity], histogram));
        Assert.Equal(0, histogram.Entries);
        Assert.Equal(0, grid.Finish().TotalSumW);
    }
}
