using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>
/// The joint block's streamed accumulation: rows with a non-finite joint feature are left out and counted, a row's
/// block is its place in its file, and batches or halves merged give one pass's numbers. The program compared with
/// itself and with sums written out by hand here.
/// </summary>
public class JointMomentsTests
{
    private static FeatureView View(double[][] columns, double[] weights, long[] fileRows)
    {
        var view = new FeatureView(columns, weights, weighted: true, fileRows) { Rows = fileRows.Length };
        return view;
    }

    [Fact]
    public void Rows_with_a_non_finite_joint_feature_are_skipped_and_counted()
    {
        // Joint features are columns 0 and 2; column 1 (not joint) may hold anything.
        double[] a = [1, double.NaN, 3, 4, double.PositiveInfinity, 6];
        double[] other = [double.NaN, 0, 0, 0, 0, 0];
        double[] c = [2, 2, double.NaN, 5, 1, 7];
        double[] w = [1, 1, 1, 2, 1, 0.5];
        var joint = new JointMoments([0, 2], JointStandardisation.Identity(2), moments: true, kernel: true);
        joint.Add(View([a, other, c], w, [0, 1, 2, 3, 4, 5]));
        Assert.Equal((3L, 3L), (joint.Rows, joint.Skipped));
        // Kept: rows 0 (block 0), 3 (block 3), 5 (block 5): the weighted mean of a is (1·1 + 2·4 + 0.5·6)/3.5 by hand.
        var fit = joint.Moments!.Fit();
        Assert.Equal(12.0 / 3.5, fit.Mean[0], 12);
        Assert.Equal((1 * 2 + 2 * 5 + 0.5 * 7) / 3.5, fit.Mean[1], 12);
        Assert.Equal(1, joint.Kernel![3].Count);
        Assert.Equal(2.0, joint.Kernel[3].WeightSum);
        Assert.Equal(0, joint.Kernel[1].Count);
    }

    [Fact]
    public void A_rows_block_is_its_place_in_its_file_and_halves_merge_to_one_pass()
    {
        var rng = new Random(5);
        const int n = 3000;
        var x = Enumerable.Range(0, n).Select(_ => rng.NextDouble() * 4 - 1).ToArray();
        var y = x.Select(v => 0.5 * v + rng.NextDouble()).ToArray();
        var w = Enumerable.Range(0, n).Select(i => i % 17 == 0 ? -0.4 : 0.5 + rng.NextDouble()).ToArray();
        var rows = Enumerable.Range(0, n).Select(i => (long)i).ToArray();
        var scale = new JointStandardisation([0.4, 0.7], [1.2, 0.9]);

        var whole = new JointMoments([0, 1], scale, true, true);
        whole.Add(View([x, y], w, rows));
        // The same rows as two batches of two "files" filled apart and merged: the second file's rows start again at
        // 0, so they are handed over with their places in their own file, as a shard's would be.
        JointMoments Part(int from, int to, long firstRow)
        {
            var part = new JointMoments([0, 1], scale, true, true);
            var middle = (from + to) / 2;
            foreach (var (s, e) in new[] { (from, middle), (middle, to) })
                part.Add(View([x[s..e], y[s..e]], w[s..e], Enumerable.Range(s, e - s).Select(i => i - from + firstRow).ToArray()));
            return part;
        }
        var merged = Part(1600, n, 1600);
        merged.Merge(Part(0, 1600, 0));
        Assert.Equal(whole.Rows, merged.Rows);
        var a = whole.State();
        var b = merged.State();
        for (var i = 0; i < a.Moments!.Count; i++)
            Assert.True(Math.Abs(a.Moments[i] - b.Moments![i]) <= 1e-12 * Math.Max(1, Math.Abs(a.Moments[i])), $"moment {i}: {a.Moments[i]} vs {b.Moments[i]}");
        for (var k = 0; k < JointMoments.Blocks; k++)
            for (var i = 0; i < a.Kernel![k].Count; i++)
                Assert.True(Math.Abs(a.Kernel[k][i] - b.Kernel![k][i]) <= 1e-12 * Math.Max(1, Math.Abs(a.Kernel[k][i])), $"kernel block {k} sum {i}");
        // Block b holds the rows whose place is b mod 16: block 5's Σw written out.
        var block5 = Enumerable.Range(0, n).Where(i => i % JointMoments.Blocks == 5).Sum(i => w[i]);
        Assert.Equal(block5, whole.Kernel![5].WeightSum, 9);
        // And the distance between the two is zero to rounding (the same rows on both sides).
        var restored = AccumulatedJointMoments.From(2, b);
        var estimate = FrechetExtrapolation.Of(whole.Moments!, restored.Moments!);
        Assert.True(Math.Abs(estimate.Raw) < 1e-12, $"{estimate.Raw}");
    }

    // Each block's weighted mean and co-moments by the two-pass textbook formulas (mean first, then Σ|w|(x − x̄)(x − x̄)ᵀ),
    // over the rows of that block and sign: an independent computation of what the streamed fill must give.
    private static (double[] Mean, double[] Comoments, long Count) TwoPass(double[][] columns, double[] w, long[] fileRows, int block, bool negative,
        double[] means, double[] sds, bool[] keep)
    {
        var d = columns.Length;
        var rows = Enumerable.Range(0, w.Length).Where(r => keep[r] && fileRows[r] % JointMoments.Blocks == block && (negative ? w[r] < 0 : w[r] > 0)).ToArray();
        var z = rows.Select(r => Enumerable.Range(0, d).Select(k => (columns[k][r] - means[k]) / sds[k]).ToArray()).ToArray();
        var a = rows.Select(r => Math.Abs(w[r])).ToArray();
        var total = a.Sum();
        var mean = Enumerable.Range(0, d).Select(k => z.Select((row, i) => a[i] * row[k]).Sum() / total).ToArray();
        var c = new double[d * d];
        for (var p = 0; p < d; p++)
            for (var q = 0; q < d; q++)
                c[p * d + q] = z.Select((row, i) => a[i] * (row[p] - mean[p]) * (row[q] - mean[q])).Sum();
        return (mean, c, rows.Length);
    }

    [Theory]
    [InlineData(false, 5, true)]   // consecutive rows, no value missing: the contiguous path, starting mid-way through the blocks
    [InlineData(true, 5, true)]    // rows thinned by a selection and a few missing values: the row-by-row placement
    [InlineData(false, 16, true)]  // a batch starting at block 0
    [InlineData(false, 5, false)]  // unit weights (no weight column), both paths
    [InlineData(true, 5, false)]
    public void Each_blocks_moments_match_a_two_pass_computation(bool irregular, long firstRow, bool weighted)
    {
        var rng = new Random(11);
        const int n = 5000, d = 7;
        var columns = Enumerable.Range(0, d).Select(k => Enumerable.Range(0, n).Select(_ => 1000 + k + rng.NextDouble() * (k + 1)).ToArray()).ToArray();
        for (var r = 0; r < n; r++) columns[3][r] += 0.8 * columns[1][r];
        var w = Enumerable.Range(0, n).Select(i => !weighted ? 1 : i % 13 == 0 ? -0.3 - rng.NextDouble() : i % 29 == 0 ? 0 : 0.2 + rng.NextDouble()).ToArray();
        var fileRows = irregular
            ? Enumerable.Range(0, n).Select(i => firstRow + 3L * i + (i % 7 == 0 ? 1 : 0)).ToArray()
            : Enumerable.Range(0, n).Select(i => firstRow + i).ToArray();
        var keep = Enumerable.Repeat(true, n).ToArray();
        if (irregular)
            foreach (var r in new[] { 3, 400, 401, 2222, 4999 })
            {
                columns[r % d][r] = r % 2 == 0 ? double.NaN : double.NegativeInfinity;
                keep[r] = false;
            }
        double[] means = [1000, 1001, 1002, 1003, 1004, 1005, 1006], sds = [0.5, 1.5, 2, 3, 1, 1.25, 4];
        var joint = new JointMoments(Enumerable.Range(0, d).ToArray(), new JointStandardisation(means, sds), true, false);
        // Two batches, so the second is taken about the first's running mean.
        FeatureView Batch(Range r) => new(columns.Select(c => c[r]).ToArray(), w[r], weighted, fileRows[r]) { Rows = fileRows[r].Length };
        joint.Add(Batch(..2000));
        joint.Add(Batch(2000..));
        Assert.Equal(keep.Count(k => !k), joint.Skipped);
        for (var b = 0; b < JointMoments.Blocks; b++)
            foreach (var negative in new[] { false, true })
            {
                var expected = TwoPass(columns, w, fileRows, b, negative, means, sds, keep);
                var got = negative ? joint.Moments!.Negative(b) : joint.Moments!.Positive(b);
                Assert.Equal(expected.Count, got.Count);
                if (expected.Count == 0) continue; // no event of this sign: nothing to compare
                for (var k = 0; k < d; k++) Assert.Equal(expected.Mean[k], got.Mean[k], 10);
                for (var i = 0; i < d * d; i++) Assert.Equal(expected.Comoments[i], got.Comoments[i], 8);
            }
    }

}
