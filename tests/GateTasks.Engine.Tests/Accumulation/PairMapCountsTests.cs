using System.Text.Json;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>
/// A declared pair's counts on its coarse map grid, as the batched fill gathers them (<see cref="PairAccumulation"/>:
/// each feature's map cells found once per batch, then counted per pair), against numpy.histogram2d over the map
/// edges with both flows (infinite outer edges), frozen with Debian's numpy 1.24.2 / Python 3.11.2 into
/// tests/fixtures/numpy/pair_map.json by tests/fixtures/numpy/make_pair_map_fixtures.py (the file records the call and
/// versions).
/// </summary>
public class PairMapCountsTests
{
    private static readonly JsonElement Fixture =
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "numpy", "pair_map.json"))).RootElement;

    private static double[] Doubles(string name) => Fixture.GetProperty(name).EnumerateArray().Select(v => v.GetDouble()).ToArray();

    [Theory]
    // One batch; batches cut at a register's and a slice's odd places (the counts are integers: any cut gives them).
    [InlineData(new[] { 20000 })]
    [InlineData(new[] { 4097, 3, 15900 })]
    public void Map_counts_agree_with_numpy_histogram2d(int[] batches)
    {
        var (x, y) = (Doubles("x"), Doubles("y"));
        Histogram Reference(double[] edges, double[] values)
        {
            var h = new Histogram(new VariableAxis(edges));
            h.Fill(values, ReadOnlySpan<double>.Empty);
            return h;
        }
        Histogram[] references = [Reference(Doubles("edges_x"), x), Reference(Doubles("edges_y"), y)];
        // The program's map grid is the fixture's (every 4th edge, the last kept).
        Assert.Equal(Doubles("map_x"), PairGrid.MapAxis(references[0].Axis).Edges.ToArray());
        Assert.Equal(Doubles("map_y"), PairGrid.MapAxis(references[1].Axis).Edges.ToArray());
        var at = new SourceLocation("pairs.yaml", 1, 1);
        var set = new PairAccumulation([new CorrelationSpec("x", "y", null, null, at)], new Dictionary<string, int> { ["x"] = 0, ["y"] = 1 },
            i => references[i]);
        var from = 0;
        foreach (var rows in batches)
        {
            set.Add(new FeatureView([x[from..(from + rows)], y[from..(from + rows)]], [], false, new long[rows]) { Rows = rows }, 2);
            from += rows;
        }
        Assert.Equal(x.Length, from);
        var cells = set.Pairs[0].Finish().Cells!;
        var expected = Fixture.GetProperty("counts").EnumerateArray().Select(v => (double)v.GetInt32()).ToArray();
        // Unit weights: each cell's Σw and Σw² are its count.
        Assert.Equal(expected, cells.SumW);
        Assert.Equal(expected, cells.SumW2);
    }
}
