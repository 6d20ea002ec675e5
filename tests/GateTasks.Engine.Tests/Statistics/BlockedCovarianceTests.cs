using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

public class BlockedCovarianceTests
{
    [Theory]
    [InlineData("d3_unweighted")]
    [InlineData("d8_weighted")]
    [InlineData("d20_unweighted")]
    [InlineData("d6_nearly_singular")]
    [InlineData("d4_signed_weights")]
    public void Mean_and_covariance_match_numpy(string name)
    {
        var c = FrechetFixture.Case(name);
        for (var side = 1; side <= 2; side++)
        {
            var (x, w) = FrechetFixture.Side(c, side);
            var fit = FrechetFixture.Accumulate(x, w, 5, 113).Fit();
            // numpy 1.24.2: numpy.average(X, axis=0, weights=w) and numpy.cov(X, rowvar=False, aweights=w, bias=True)
            // (the population form written out for signed weights), as recorded in the case's call_cov.
            FrechetFixture.Near(c.Numbers($"mean{side}"), fit.Mean, 1e-11, 1e-13);
            FrechetFixture.Near(c.Numbers($"cov{side}"), fit.Covariance, 1e-10, 1e-13);
        }
    }

    [Fact]
    public void Merged_shards_equal_one_pass()
    {
        // Compares the program with itself: two files, one streamed in one pass and in shards of other batch sizes
        // merged (one through State/Restore), give the same blocks and the same estimate to rounding.
        var c = FrechetFixture.Case("d4_signed_weights");
        var (x1, w1) = FrechetFixture.Side(c, 1);
        var (x2, w2) = FrechetFixture.Side(c, 2);
        var one = new BlockedCovariance(4, 6);
        FrechetFixture.Feed(one, x1, w1, 0, 600, 128, 0);
        FrechetFixture.Feed(one, x2, w2, 0, 600, 128, 0);

        var shardA = new BlockedCovariance(4, 6);
        FrechetFixture.Feed(shardA, x1, w1, 0, 250, 31, 0);
        var shardB = new BlockedCovariance(4, 6);
        FrechetFixture.Feed(shardB, x1, w1, 250, 600, 50, 0);
        FrechetFixture.Feed(shardB, x2, w2, 0, 600, 1000, 0);
        var restored = new BlockedCovariance(4, 6);
        Assert.True(restored.Restore(shardB.State()));
        shardA.Merge(restored);

        Assert.Equal(one.Count, shardA.Count);
        for (var b = 0; b < 6; b++)
        {
            var p = one.Fit([b]);
            var q = shardA.Fit([b]);
            FrechetFixture.Near(p.Mean, q.Mean, 1e-12, 1e-14);
            FrechetFixture.Near(p.Covariance, q.Covariance, 1e-11, 1e-14);
            Assert.Equal(p.EffectiveCount, q.EffectiveCount, 1e-9);
        }
        var reference = FrechetFixture.Accumulate(x2, w2, 6, 200);
        var e1 = FrechetExtrapolation.Of(reference, one);
        var e2 = FrechetExtrapolation.Of(reference, shardA);
        Assert.Equal(e1.Raw, e2.Raw, 1e-10);
        Assert.Equal(e1.Extrapolated, e2.Extrapolated, 1e-10);
        Assert.Equal(e1.StandardError, e2.StandardError, 1e-10);
    }

    [Fact]
    public void Restore_refuses_another_shape()
    {
        // Documented behaviour: a state for other d or B is refused (false), not misread.
        var a = new BlockedCovariance(3, 4);
        Assert.False(new BlockedCovariance(3, 5).Restore(a.State()));
        Assert.False(new BlockedCovariance(2, 4).Restore(a.State()));
        Assert.False(a.Restore(new double[17]));
        Assert.True(new BlockedCovariance(3, 4).Restore(a.State()));
    }

    [Fact]
    public void Signed_weights_whose_running_sum_passes_through_zero()
    {
        // Rows fed one at a time with weights +1, −1 (Σw = 0), +0.5, −0.5 (0 again), then +2, −0.5, +1.
        double[] x = [1.0, 3.0, -2.0, 0.5, 4.0, 2.0, -1.0];
        double[] y = [0.0, 1.0, 2.0, -1.0, 3.0, 0.5, 1.5];
        double[] w = [1.0, -1.0, 0.5, -0.5, 2.0, -0.5, 1.0];
        var acc = new BlockedCovariance(2, 3);
        for (var i = 0; i < x.Length; i++)
        {
            acc.AddBatch([new[] { x[i] }, new[] { y[i] }], [w[i]], i);
            if (i == 1 || i == 3)
            {
                // Documented behaviour: with Σw = 0 there is no mean or covariance (NaN), never a division by zero.
                var undefined = acc.Fit();
                Assert.False(undefined.IsDefined);
                Assert.All(undefined.Mean, v => Assert.True(double.IsNaN(v)));
                Assert.All(undefined.Covariance, v => Assert.True(double.IsNaN(v)));
            }
        }
        var fit = acc.Fit();
        // Definition of the weighted mean and population covariance, Σw·x/Σw and Σw(x − x̄)(y − ȳ)/Σw with Σw = 2.5,
        // evaluated directly here [hand formula, two passes]: exact for signed weights.
        var sw = w.Sum();
        var mx = x.Zip(w, (a, b) => a * b).Sum() / sw;
        var my = y.Zip(w, (a, b) => a * b).Sum() / sw;
        double cxx = 0, cxy = 0, cyy = 0;
        for (var i = 0; i < x.Length; i++)
        {
            cxx += w[i] * (x[i] - mx) * (x[i] - mx);
            cxy += w[i] * (x[i] - mx) * (y[i] - my);
            cyy += w[i] * (y[i] - my) * (y[i] - my);
        }
        Assert.Equal(2.5, fit.SumOfWeights, 14);
        FrechetFixture.Near([mx, my], fit.Mean, 1e-13, 1e-14);
        FrechetFixture.Near([cxx / sw, cxy / sw, cxy / sw, cyy / sw], fit.Covariance, 1e-12, 1e-14);
        // Kish (1965): (Σw)²/Σw² = 2.5² / (1 + 1 + 0.25 + 0.25 + 4 + 0.25 + 1) = 6.25 / 7.75.
        Assert.Equal(6.25 / 7.75, fit.EffectiveCount, 12);
    }

    [Fact]
    public void Integer_weights_equal_repeated_rows()
    {
        // A weight of k is k copies of the row (definition of a frequency weight).
        double[] x = [1, 2, 3, 4, 5], y = [2, 1, 4, 3, 6];
        int[] k = [1, 3, 2, 1, 2];
        var weighted = new BlockedCovariance(2, 2);
        weighted.AddBatch([x, y], k.Select(v => (double)v).ToArray(), [0, 0, 0, 0, 0]);
        var rx = x.SelectMany((v, i) => Enumerable.Repeat(v, k[i])).ToArray();
        var ry = y.SelectMany((v, i) => Enumerable.Repeat(v, k[i])).ToArray();
        var repeated = new BlockedCovariance(2, 2);
        repeated.AddBatch([rx, ry], [], new int[rx.Length]);
        FrechetFixture.Near(repeated.Fit().Mean, weighted.Fit().Mean, 1e-14, 1e-15);
        FrechetFixture.Near(repeated.Fit().Covariance, weighted.Fit().Covariance, 1e-13, 1e-15);
    }

    [Fact]
    public void Rows_go_to_the_block_of_their_file_index()
    {
        // Documented behaviour: row i of a batch starting at file row r goes to block (r + i) mod B.
        var acc = new BlockedCovariance(1, 3);
        acc.AddBatch([new double[] { 10, 11, 12, 13 }], [], 5); // file rows 5..8 → blocks 2, 0, 1, 2
        Assert.Equal(11.0, acc.Fit([0]).Mean[0]);
        Assert.Equal(12.0, acc.Fit([1]).Mean[0]);
        Assert.Equal(11.5, acc.Fit([2]).Mean[0]);
    }

    [Fact]
    public void Non_finite_values_are_refused_and_leave_the_state_unchanged()
    {
        // Documented behaviour: the caller filters missing values; a NaN is named by column and row, nothing is added.
        var acc = new BlockedCovariance(2, 2);
        acc.AddBatch([new double[] { 1, 2 }, new double[] { 3, 4 }], [], 0);
        var before = acc.State();
        var e = Assert.Throws<ArgumentException>(() => acc.AddBatch([new double[] { 1, 2 }, new double[] { 3, double.NaN }], [], 2));
        Assert.Contains("column 1, row 1", e.Message);
        Assert.Equal(before, acc.State());
    }
}
