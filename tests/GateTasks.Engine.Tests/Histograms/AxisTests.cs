using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Tests.Histograms;

public class AxisTests
{
    [Fact]
    public void Regular_axis_bins_are_half_open_with_explicit_flows()
    {
        var a = new RegularAxis(4, 0, 2);
        Assert.Equal(Axis.Underflow, a.Index(-1e-300));
        Assert.Equal(0, a.Index(0));
        Assert.Equal(0, a.Index(0.4999999999));
        Assert.Equal(1, a.Index(0.5));
        Assert.Equal(3, a.Index(1.9999999999));
        Assert.Equal(a.Overflow, a.Index(2)); // the upper edge belongs to the overflow
        Assert.Equal(a.Overflow, a.Index(double.PositiveInfinity));
        Assert.Equal(Axis.Underflow, a.Index(double.NegativeInfinity));
    }

    [Fact]
    public void Regular_axis_agrees_with_its_stored_edges_next_to_every_edge()
    {
        // 0.1-wide bins are not exact in binary; the computed index must still follow the stored edges.
        var a = new RegularAxis(1000, -3.7, 96.3);
        var edges = a.Edges.ToArray();
        for (var i = 0; i < 1000; i++)
        {
            Assert.Equal(i, a.Index(edges[i]));
            Assert.Equal(i, a.Index(Math.BitDecrement(edges[i + 1])));
        }
    }

    [Fact]
    public void Variable_axis_uses_binary_search_and_rejects_bad_edges()
    {
        var a = new VariableAxis([0, 1, 10, 100]);
        Assert.Equal(0, a.Index(0.5));
        Assert.Equal(1, a.Index(1));
        Assert.Equal(2, a.Index(99.999));
        Assert.Equal(3, a.Index(100));
        Assert.Throws<ArgumentException>(() => new VariableAxis([0, 1, 1]));
        Assert.Throws<ArgumentException>(() => new VariableAxis([0, double.NaN]));
        Assert.Throws<ArgumentException>(() => new VariableAxis([0]));
    }

    [Fact]
    public void FromEdges_picks_a_regular_axis_only_for_exactly_regular_edges()
    {
        Assert.IsType<RegularAxis>(Axis.FromEdges(new RegularAxis(7, 1, 8).Edges.ToArray()));
        Assert.IsType<VariableAxis>(Axis.FromEdges([0, 1, 3]));
    }
}
