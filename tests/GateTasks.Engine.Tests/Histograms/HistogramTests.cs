using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Tests.Histograms;

public class HistogramTests
{
    [Fact]
    public void Cells_carry_sum_of_weights_and_squares_and_NaN_is_counted_apart()
    {
        var h = new Histogram(new RegularAxis(2, 0, 2));
        h.Fill([-1, 0.5, 0.5, 1.5, 2, double.NaN], [1, 2, 3, 4, 5, 6]);
        Assert.Equal([1, 5, 4, 5], h.Storage.SumW.ToArray());
        Assert.Equal([1, 13, 16, 25], h.Storage.SumW2.ToArray());
        Assert.Equal(1, h.NanEntries);
        Assert.Equal(6, h.NanSumW);
        Assert.Equal(36, h.NanSumW2);
        Assert.Equal(6, h.Entries);
        Assert.Equal(15, h.TotalSumW); // NaN never lands in a flow cell or the total
    }

    [Fact]
    public void Adding_histograms_is_exact_and_order_independent()
    {
        var axis = new VariableAxis([0, 1, 2, 4]);
        var values = Enumerable.Range(0, 1000).Select(i => (i * 0.37) % 5 - 0.5).ToArray();
        var whole = new Histogram(axis);
        whole.Fill(values, []);
        var a = new Histogram(axis);
        var b = new Histogram(axis);
        a.Fill(values.AsSpan(0, 400), []);
        b.Fill(values.AsSpan(400), []);
        b.Add(a);
        Assert.Equal(whole.Storage.SumW.ToArray(), b.Storage.SumW.ToArray());
        Assert.Equal(whole.Entries, b.Entries);
        Assert.Throws<ArgumentException>(() => b.Add(new Histogram(new RegularAxis(3, 0, 4))));
    }
}
