using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>
/// The kernel distance's sample subsample: a bounded store whatever the number of rows, the K rows of smallest key
/// (ties kept, copies of one event together), the same rows and sums whatever the batching, order or shards. The
/// program compared with itself and with a selection written out here from <see cref="JointRowHash.Of"/>.
/// </summary>
public class KernelSubsampleTests
{
    private static FeatureView View(double[][] columns, double[]? weights, int from, int to)
    {
        var cols = columns.Select(c => c[from..to]).ToArray();
        var w = weights?[from..to] ?? new double[to - from];
        return new FeatureView(cols, w, weighted: weights is not null, Enumerable.Range(from, to - from).Select(i => (long)i).ToArray()) { Rows = to - from };
    }

    private static (double[] X, double[] Y, double[] W) Draw(int n, int seed)
    {
        var rng = new Random(seed);
        var x = Enumerable.Range(0, n).Select(_ => rng.NextDouble() * 4 - 1).ToArray();
        var y = x.Select(v => 0.5 * v + rng.NextDouble()).ToArray();
        var w = Enumerable.Range(0, n).Select(i => i % 13 == 0 ? -0.3 : 0.5 + rng.NextDouble()).ToArray();
        return (x, y, w);
    }

    [Fact]
    public void The_store_stays_bounded_and_keeps_the_k_rows_of_smallest_key()
    {
        const int n = 200_000, k = 1000;
        var (x, y, w) = Draw(n, 3);
        var subsample = new KernelSubsample(2, k);
        var most = 0;
        for (var s = 0; s < n; s += 4096)
        {
            subsample.Add(View([x, y], w, s, Math.Min(n, s + 4096)), [0, 1]);
            most = Math.Max(most, subsample.Capacity);
        }
        // Never more than 2K entries of room, whatever n (docs/contract.md, kernel-rows).
        Assert.True(most <= 2 * k, $"capacity {most}");
        var state = subsample.State();
        Assert.Equal(k, state.Counts.Count);
        // The rows with the K smallest keys, by hand from the row hash: the same set.
        var expected = Enumerable.Range(0, n).OrderBy(i => JointRowHash.SelectionKey(JointRowHash.Of([x[i], y[i]]))).Take(k)
            .Select(i => (x[i], y[i], w[i])).OrderBy(t => t).ToList();
        var kept = Enumerable.Range(0, k).Select(i => (state.Values[2 * i], state.Values[2 * i + 1], state.WeightTerms[i].Single())).OrderBy(t => t).ToList();
        Assert.Equal(expected, kept);
    }

    [Fact]
    public void Copies_of_one_event_are_kept_together_as_one_entry_with_their_exact_weight_sums()
    {
        const int n = 5000, k = 1000;
        var (x0, y0, w0) = Draw(n, 4);
        // Every event twice: once as weight w + 0.5 and once as −0.5 (an event split into signed weights), and every
        // tenth event a third time as a copy of the first part.
        var x = new List<double>();
        var y = new List<double>();
        var w = new List<double>();
        for (var i = 0; i < n; i++)
            foreach (var part in i % 10 == 0 ? new[] { w0[i] + 0.5, -0.5, w0[i] + 0.5 } : new[] { w0[i] + 0.5, -0.5 })
            {
                x.Add(x0[i]);
                y.Add(y0[i]);
                w.Add(part);
            }
        var subsample = new KernelSubsample(2, k);
        subsample.Add(View([x.ToArray(), y.ToArray()], w.ToArray(), 0, x.Count), [0, 1]);
        var state = subsample.State();
        // K events, each one entry holding all of its rows: Σw and Σw² exact (fsum of the parts, by hand here).
        Assert.Equal(k, state.Counts.Count);
        var index = Enumerable.Range(0, n).ToDictionary(i => (x0[i], y0[i]));
        for (var e = 0; e < k; e++)
        {
            var i = index[(state.Values[2 * e], state.Values[2 * e + 1])];
            var parts = i % 10 == 0 ? new[] { w0[i] + 0.5, -0.5, w0[i] + 0.5 } : new[] { w0[i] + 0.5, -0.5 };
            Assert.Equal(parts.Length, state.Counts[e]);
            var weights = new GateTasks.Engine.Statistics.ExactSum();
            foreach (var t in state.WeightTerms[e]) weights.Add(t);
            var expected = new GateTasks.Engine.Statistics.ExactSum();
            foreach (var p in parts) expected.Add(p);
            Assert.Equal(expected.Value, weights.Value);
        }
    }

    [Fact]
    public void A_block_of_fewer_distinct_value_rows_than_k_keeps_every_row()
    {
        // 100 000 rows over 7 × 9 = 63 distinct value rows (discrete features), K = 1000: all rows kept, 63 entries.
        const int n = 100_000;
        var rng = new Random(8);
        var x = Enumerable.Range(0, n).Select(_ => (double)rng.Next(7)).ToArray();
        var y = Enumerable.Range(0, n).Select(_ => (double)rng.Next(9) - 4).ToArray();
        var subsample = new KernelSubsample(2, 1000);
        for (var s = 0; s < n; s += 10_000) subsample.Add(View([x, y], null, s, s + 10_000), [0, 1]);
        var (blocks, rows) = subsample.Sums([0.0, 0.0], [1.0, 1.0], 16);
        Assert.Equal(n, rows);
        Assert.Equal(63, subsample.Entries);
        Assert.True(subsample.Capacity <= 2000, $"capacity {subsample.Capacity}");
        Assert.Equal((double)n, blocks.Sum(b => b.WeightSum));
        Assert.Equal((double)n, blocks.Sum(b => b.WeightSquareSum));
    }

    [Fact]
    public void Batches_orders_and_shards_give_the_same_sums_to_the_bit()
    {
        const int n = 20_000, k = 1500;
        var (x, y, w) = Draw(n, 5);
        var means = new[] { 0.4, 0.7 };
        var sds = new[] { 1.2, 0.9 };
        var one = new KernelSubsample(2, k);
        one.Add(View([x, y], w, 0, n), [0, 1]);
        // Three shards in small batches, merged in another order, one of them through its state (a partial).
        var parts = new[] { (0, 3000), (3000, 11000), (11000, n) }.Select(p =>
        {
            var s = new KernelSubsample(2, k);
            for (var b = p.Item1; b < p.Item2; b += 700) s.Add(View([x, y], w, b, Math.Min(p.Item2, b + 700)), [0, 1]);
            return s;
        }).ToArray();
        var restored = new KernelSubsample(2, k);
        Assert.Null(restored.AddState(parts[0].State()));
        var merged = parts[2];
        merged.Merge(parts[1]);
        merged.Merge(restored);
        var (a, rowsA) = one.Sums(means, sds, 16);
        var (b2, rowsB) = merged.Sums(means, sds, 16);
        Assert.Equal(k, rowsA);
        Assert.Equal(rowsA, rowsB);
        for (var blk = 0; blk < 16; blk++)
            Assert.Equal(a[blk].State(), b2[blk].State()); // exact equality of every number
    }

    [Fact]
    public void With_no_more_rows_than_k_the_sums_are_those_of_every_row()
    {
        const int n = 3000;
        var (x, y, w) = Draw(n, 6);
        var subsample = new KernelSubsample(2, 5000);
        subsample.Add(View([x, y], w, 0, n), [0, 1]);
        var (blocks, rows) = subsample.Sums([0.0, 0.0], [1.0, 1.0], 16);
        Assert.Equal(n, rows);
        var all = new CubicKernelFeatureSums(2);
        for (var i = 0; i < n; i++) all.Add([x[i], y[i]], w[i]);
        var merged = new CubicKernelFeatureSums(2);
        foreach (var blk in blocks) merged.Merge(blk);
        // The program compared with itself: every row's sums, in another order and split, agree to rounding.
        var (s, t) = (all.State(), merged.State());
        for (var i = 0; i < s.Length; i++) Assert.True(Math.Abs(s[i] - t[i]) <= 1e-9 * (1 + Math.Abs(s[i])), $"{i}: {s[i]} vs {t[i]}");
    }

    [Fact]
    public void Non_finite_rows_are_never_kept()
    {
        double[] x = [1, double.NaN, 3, double.PositiveInfinity, 5];
        double[] y = [1, 2, 3, 4, double.NegativeInfinity];
        var subsample = new KernelSubsample(2, 1000);
        subsample.Add(View([x, y], null, 0, 5), [0, 1]);
        Assert.Equal(2, subsample.Rows());
    }

    [Fact]
    public void Minus_zero_hashes_as_zero_and_a_row_hashes_alike_alone_or_in_a_chunk()
    {
        Assert.Equal(JointRowHash.Of([0.0, 1.5]), JointRowHash.Of([-0.0, 1.5]));
        Assert.NotEqual(JointRowHash.Of([1.5, 0.0]), JointRowHash.Of([0.0, 1.5]));
        double[] a = [3.25, -0.0, 7e-300];
        double[] b = [1.0, 2.0, double.NaN];
        var hashes = new ulong[3];
        JointRowHash.Begin(hashes);
        JointRowHash.Mix(a, hashes);
        JointRowHash.Mix(b, hashes);
        JointRowHash.End(hashes);
        for (var r = 0; r < 3; r++) Assert.Equal(JointRowHash.Of([a[r], b[r]]), hashes[r]);
    }
}
