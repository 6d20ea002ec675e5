using System.Text.Json;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Tests.Histograms;

/// <summary>
/// The two-level edge counting of float32 values on long axes against numpy's placement: numpy.searchsorted(edges,
/// values as float64, side="right") with Debian's numpy 1.24 on Python 3.11, frozen into
/// tests/fixtures/numpy/searchsorted.json by tests/fixtures/numpy/make_searchsorted_fixtures.py (a 4 105-edge fine grid
/// of a log-normal law, edges closer than a float32 step, and a 70-edge axis), each edge probed at its float32 value
/// and both float32 neighbours.
/// </summary>
public class BlockEdgeCountSearchTests
{
    public static TheoryData<string> Cases() => new(Fixture().RootElement.GetProperty("cases").EnumerateArray().Select(c => c.GetProperty("name").GetString()!));

    private static JsonDocument Fixture() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "numpy", "searchsorted.json")));

    private static (double[] Edges, float[] Values, int[] Cells) Case(string name)
    {
        var c = Fixture().RootElement.GetProperty("cases").EnumerateArray().Single(x => x.GetProperty("name").GetString() == name);
        return (c.GetProperty("edges").EnumerateArray().Select(e => e.GetDouble()).ToArray(),
            c.GetProperty("values").EnumerateArray().Select(e => (float)e.GetDouble()).ToArray(),
            c.GetProperty("cells").EnumerateArray().Select(e => e.GetInt32()).ToArray());
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Float_values_land_where_numpy_searchsorted_places_them(string name)
    {
        var (edges, values, expected) = Case(name);
        var nanCell = edges.Length + 1;
        // Through the axis (the two-level count where the machine has SIMD registers, else the guide table) ...
        var cells = new int[values.Length];
        new VariableAxis(edges).Cells(values, cells, nanCell);
        for (var i = 0; i < values.Length; i++)
            Assert.True(expected[i] == cells[i], $"{name}: x = {values[i]:R}: cell {cells[i]}, numpy {expected[i]}");
        if (!BlockEdgeCountSearch.IsSupported) return;
        // ... and the search itself, in blocks of every length (whole SIMD registers and a scalar rest).
        var search = new BlockEdgeCountSearch(edges);
        foreach (var length in new[] { values.Length, 31, 33, 7 })
        {
            Array.Fill(cells, -1);
            for (var start = 0; start < values.Length; start += length)
            {
                var n = Math.Min(length, values.Length - start);
                search.Cells(values.AsSpan(start, n), cells.AsSpan(start, n), nanCell);
            }
            for (var i = 0; i < values.Length; i++)
                Assert.True(expected[i] == cells[i], $"{name}, blocks of {length}: x = {values[i]:R}: cell {cells[i]}, numpy {expected[i]}");
        }
    }

    [Fact]
    public void Nan_gets_the_nan_cell_and_infinities_the_flows()
    {
        // By the axis's definition (docs: NaN apart, −∞ below every edge, +∞ at or above the last): not from numpy.
        var (edges, _, _) = Case("fine_grid_lognormal");
        float[] values = [float.NaN, float.NegativeInfinity, float.PositiveInfinity, float.NaN];
        var cells = new int[values.Length];
        new VariableAxis(edges).Cells(values, cells, edges.Length + 1);
        Assert.Equal([edges.Length + 1, 0, edges.Length, edges.Length + 1], cells);
    }
}
