using System.Globalization;
using System.Text.Json;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Tests.Histograms;

/// <summary>
/// The guide table in front of the long-axis edge count, against numpy's placement: numpy.searchsorted(edges, values
/// as float64, side="right") with Debian's numpy 1.24.2 on Python 3.11, frozen into tests/fixtures/numpy/guide_search.json
/// by tests/fixtures/numpy/make_guide_search_fixtures.py — fine grids of a normal law and of a peak with Cauchy tails,
/// a 300-edge spike with repeated float edges, infinite outer edges, and edges among the subnormal floats; each edge
/// probed at its float32 value and both neighbours, with signed zeros, subnormals, the largest floats, ±∞ and NaN.
/// NaN's own cell is the axis's definition, not numpy's (which sorts NaN last).
/// </summary>
public class EdgeGuideTests
{
    public static TheoryData<string> Cases() => new(Fixture().RootElement.GetProperty("cases").EnumerateArray().Select(c => c.GetProperty("name").GetString()!));

    private static JsonDocument Fixture() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "numpy", "guide_search.json")));

    private static (double[] Edges, float[] Values, int[] Cells) Case(string name)
    {
        var c = Fixture().RootElement.GetProperty("cases").EnumerateArray().Single(x => x.GetProperty("name").GetString() == name);
        static double Parse(JsonElement e) => double.Parse(e.GetString()!, CultureInfo.InvariantCulture);
        return (c.GetProperty("edges").EnumerateArray().Select(Parse).ToArray(),
            c.GetProperty("values").EnumerateArray().Select(e => (float)Parse(e)).ToArray(),
            c.GetProperty("cells").EnumerateArray().Select(e => e.GetInt32()).ToArray());
    }

    private static int Expected(float value, int numpyCell, int nanCell) => float.IsNaN(value) ? nanCell : numpyCell;

    [Theory]
    [MemberData(nameof(Cases))]
    public void Search_with_the_guide_places_values_as_numpy_searchsorted(string name)
    {
        if (!BlockEdgeCountSearch.IsSupported) return;
        var (edges, values, numpy) = Case(name);
        var nanCell = edges.Length + 1;
        var search = new BlockEdgeCountSearch(edges);
        var cells = new int[values.Length];
        // Blocks of every length: whole chunks, a chunk and a SIMD register's rest, and short ones.
        foreach (var length in new[] { values.Length, EdgeGuide.Chunk, 263, 7 })
        {
            Array.Fill(cells, -1);
            for (var start = 0; start < values.Length; start += length)
            {
                var n = Math.Min(length, values.Length - start);
                search.Cells(values.AsSpan(start, n), cells.AsSpan(start, n), nanCell);
            }
            for (var i = 0; i < values.Length; i++)
                Assert.True(Expected(values[i], numpy[i], nanCell) == cells[i],
                    $"{name}, blocks of {length}: x = {values[i]:R}: cell {cells[i]}, numpy {numpy[i]}");
        }
    }

    [Theory]
    [InlineData("normal_fine_grid", false, 0.01)]
    [InlineData("peak_with_cauchy_tails", true, 0.05)]
    [InlineData("spikes_and_repeated_float_edges", false, 0.2)]
    [InlineData("infinite_outer_edges", true, 0.05)]
    [InlineData("subnormal_edges", false, 0.3)]
    public void Guide_answers_most_values_as_numpy_and_leaves_crowded_ones(string name, bool mapsBits, double mostCrowded)
    {
        if (!EdgeGuide.IsSupported) return;
        var (edges, values, numpy) = Case(name);
        var nanCell = edges.Length + 1;
        var guide = EdgeGuide.Create(EdgeCountSearch.Float32Edges(edges));
        Assert.NotNull(guide);
        // Which map the guide picks, and how many values it leaves, are its own design, not numpy's: the long tails
        // need the bits map; the spikes and repeated edges must leave some values to the three-level count.
        Assert.Equal(mapsBits, guide.MapsBits);
        var cells = new int[EdgeGuide.Chunk];
        var crowded = new int[EdgeGuide.Chunk];
        // Counted among the values inside the edges' central 98% (values past the outermost edges may share an end
        // bucket with them, as a trimmed map puts them there).
        var floats = EdgeCountSearch.Float32Edges(edges);
        float innerLo = floats[floats.Length / 100], innerHi = floats[floats.Length - 1 - floats.Length / 100];
        int left = 0, inner = 0;
        for (var start = 0; start < values.Length; start += EdgeGuide.Chunk)
        {
            var n = Math.Min(EdgeGuide.Chunk, values.Length - start);
            Array.Fill(cells, -1);
            var k = guide.Cells(values.AsSpan(start, n), cells, nanCell, crowded);
            var skipped = crowded.AsSpan(0, k).ToArray().ToHashSet();
            for (var i = 0; i < n; i++)
            {
                var x = values[start + i];
                var central = x >= innerLo && x <= innerHi;
                inner += central ? 1 : 0;
                if (skipped.Contains(i))
                {
                    left += central ? 1 : 0;
                    continue;
                }
                Assert.True(Expected(x, numpy[start + i], nanCell) == cells[i], $"{name}: x = {x:R}: cell {cells[i]}, numpy {numpy[start + i]}");
            }
        }
        Assert.True(left <= mostCrowded * inner, $"{name}: {left} of {inner} central values left to the search");
        if (name.StartsWith("spikes", StringComparison.Ordinal)) Assert.True(left > 0, "the spike's values should be left to the search");
    }
}
