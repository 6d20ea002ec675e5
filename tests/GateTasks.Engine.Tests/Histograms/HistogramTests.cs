using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Tests.Histograms;

public class HistogramTests
{
    [Fact]
    public void Cells_carry_sum_of_weights_and_squares_and_NaN_is_counted_apart()
    {
        var h = new Histogram(new RegularAxis(2, 0, 2));
        h.Fill([-1, 0.5, 0.5, 1.5, 2, double.NaN], [1, 2, 3, 4, 5, 6]);
        Assert.Equal([1, 5, 4, 5], h.SumW.ToArray());
        Assert.Equal([1, 13, 16, 25], h.SumW2.ToArray());
        Assert.Equal(1, h.NanEntries);
        Assert.Equal(6, h.NanSumW);
        Assert.Equal(36, h.NanSumW2);
        Assert.Equal(6, h.Entries);
        Assert.Equal(15, h.TotalSumW); // NaN never lands in a flow cell or the total
        // The same cells by name [by hand from the fills above].
        Assert.Equal(1, h.UnderflowSumW);
        Assert.Equal(5, h.BinSumW(0));
        Assert.Equal(13, h.BinSumW2(0));
        Assert.Equal(4, h.BinSumW(1));
        Assert.Equal(16, h.BinSumW2(1));
        Assert.Equal(5, h.OverflowSumW);
    }

    [Fact]
    public void Rebinning_sums_whole_bins_and_keeps_flows_and_NaN_apart()
    {
        // By hand: bins [0,1) [1,2) [2,3) [3,4) hold 1, 2, 3, 4 (unit weights); on edges 0, 2, 4 they become 3 and 7,
        // and the underflow (one value), the overflow (two) and NaN (one) stay where they were.
        var h = new Histogram(new RegularAxis(4, 0, 4));
        h.Fill([-1, 0.5, 1.5, 1.5, 2.5, 2.5, 2.5, 3.5, 3.5, 3.5, 3.5, 4, 9, double.NaN], []);
        var coarse = h.Rebinned(new VariableAxis([0, 2, 4]), h.Entries);
        Assert.Equal([1, 3, 7, 2], coarse.SumW.ToArray());
        Assert.Equal([1, 3, 7, 2], coarse.SumW2.ToArray());
        Assert.Equal(1, coarse.NanEntries);
        Assert.Equal(1, coarse.NanSumW);
        Assert.Equal(14, coarse.Entries);
    }

    [Fact]
    public void Quantiles_interpolate_within_a_bin()
    {
        // Uniform on [0, 10) in 10 bins of 100 entries: the p-quantile is 10p and the density 0.1 (exact by construction).
        var axis = new RegularAxis(10, 0, 10);
        var cells = new double[12];
        for (var i = 1; i <= 10; i++) cells[i] = 100;
        var h = Histogram.FromCells(axis, cells, cells, 1000, 0, 0, 0);
        foreach (var p in new[] { 0.05, 0.5, 0.95, 0.333 })
        {
            var (q, f) = h.Quantile(p);
            Assert.Equal(10 * p, q, 12);
            Assert.Equal(0.1, f, 12);
        }
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
        Assert.Equal(whole.SumW.ToArray(), b.SumW.ToArray());
        Assert.Equal(whole.Entries, b.Entries);
        Assert.Throws<ArgumentException>(() => b.Add(new Histogram(new RegularAxis(3, 0, 4))));
    }

    [Theory]
    [InlineData(false, false)]
    [InlineData(false, true)]
    [InlineData(true, false)]
    [InlineData(true, true)]
    public void Filling_a_span_counts_every_value_where_a_binary_search_over_the_edges_puts_it(bool variable, bool weighted)
    {
        // The textbook placement (Array.BinarySearch over the edges, half-open bins, flows at the ends, NaN apart),
        // value by value, against the block-wise fill; 5 000 values span several fill blocks.
        var edges = variable ? new[] { -3, -1.5, -0.2, 0, 0.1, 0.7, 2, 3.5 } : Enumerable.Range(0, 13).Select(i => -3 + 0.5 * i).ToArray();
        var axis = variable ? (Axis)new VariableAxis(edges) : new RegularAxis(12, -3, 3);
        Assert.Equal(edges, axis.Edges.ToArray());
        var rng = new MathNet.Numerics.Random.Xoshiro256StarStar(9);
        var values = Enumerable.Range(0, 5_000).Select(i => (i % 97) switch
        {
            0 => double.NaN,
            1 => double.PositiveInfinity,
            2 => double.NegativeInfinity,
            3 => edges[i % edges.Length],
            _ => rng.NextDouble() * 8 - 4,
        }).ToArray();
        var weights = weighted ? values.Select(_ => Math.Round(rng.NextDouble() * 4 - 1, 3)).ToArray() : [];
        var h = new Histogram(axis);
        h.Fill(values, weights);

        var sumW = new double[edges.Length + 1];
        var sumW2 = new double[edges.Length + 1];
        double nanW = 0, nanW2 = 0;
        long nan = 0;
        for (var i = 0; i < values.Length; i++)
        {
            var (x, w) = (values[i], weighted ? weights[i] : 1.0);
            if (double.IsNaN(x)) { nan++; nanW += w; nanW2 += w * w; continue; }
            var bin = x < edges[0] ? -1 : x >= edges[^1] ? edges.Length - 1 : Array.BinarySearch(edges, x) is var k && k >= 0 ? k : ~k - 1;
            sumW[bin + 1] += w;
            sumW2[bin + 1] += w * w;
        }
        Assert.Equal(sumW, h.SumW.ToArray());
        Assert.Equal(sumW2, h.SumW2.ToArray());
        Assert.Equal(values.Length, h.Entries);
        Assert.Equal(nan, h.NanEntries);
        Assert.Equal(nanW, h.NanSumW);
        Assert.Equal(nanW2, h.NanSumW2);
    }
}
