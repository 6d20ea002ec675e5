using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Tests.References;

public class QuantileGridTests
{
    [Fact]
    public void Quantiles_of_a_uniform_grid_sample_are_within_one_cell()
    {
        // 0, 1, ..., 99 999: the p-quantile of this discrete uniform sample is about p·10^5 (exact by construction).
        var values = Enumerable.Range(0, 100_000).Select(i => (double)i).ToArray();
        var grid = new QuantileGrid(values.Min(), values.Max());
        grid.Fine.Fill(values, []);
        var cell = (values.Max() - values.Min()) / QuantileGrid.Cells;
        foreach (var p in new[] { 0.01, 0.05, 0.5, 0.9, 0.999 })
            Assert.InRange(grid.Quantile(p), p * 100_000 - 2 * cell, p * 100_000 + 2 * cell);
    }

    [Fact]
    public void Equal_probability_edges_merge_at_a_spike_and_rebin_exactly()
    {
        // 60% of the events sit at exactly zero (an absent object), the rest spread over (0, 10].
        var values = Enumerable.Range(0, 10_000).Select(i => i < 6000 ? 0.0 : (i - 5999) / 400.0).ToArray();
        var grid = new QuantileGrid(values.Min(), values.Max());
        grid.Fine.Fill(values, []);
        var edges = grid.EqualProbabilityEdges(10);
        Assert.True(edges.Length - 1 < 10, "the spike swallows several equal-probability bins");
        Assert.Equal(0, edges[0]);
        var h = grid.Fine.Rebinned(new VariableAxis(edges), values.Length);
        Assert.Equal(6000, h.SumW[1]); // the whole spike in the first bin
        Assert.Equal(10_000, h.TotalSumW);
        var direct = new Histogram(new VariableAxis(edges));
        direct.Fill(values, []);
        Assert.Equal(direct.SumW.ToArray(), h.SumW.ToArray());
    }

    [Fact]
    public void A_constant_feature_still_gets_an_axis()
    {
        var (lo, hi) = QuantileGrid.Span(3, 3);
        Assert.True(hi > lo);
        Assert.True(lo < 3 && hi > 3);
    }
}
