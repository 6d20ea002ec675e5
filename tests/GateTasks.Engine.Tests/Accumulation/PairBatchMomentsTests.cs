using System.Text.Json;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>
/// The pairs' batched co-moments (<see cref="PairBatchMoments"/>: two passes vectorised over events, slice by slice,
/// each batch joined to the running co-moments by the pairwise update) against numpy: numpy.corrcoef and numpy.cov
/// (bias=True) of three columns, with the twelve central co-moments of order 2–4 of each pair summed exactly rounded
/// by math.fsum, frozen with Debian's numpy 1.24.2 / Python 3.11.2 into tests/fixtures/numpy/comoments.json by
/// tests/fixtures/numpy/make_comoment_fixtures.py (the file records the calls and versions).
/// </summary>
public class PairBatchMomentsTests
{
    private static readonly JsonElement Cases =
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "numpy", "comoments.json"))).RootElement.GetProperty("cases");

    private static JsonElement Case(string name) => Cases.EnumerateArray().Single(c => c.GetProperty("name").GetString() == name);

    private static double[] Doubles(JsonElement a) => a.EnumerateArray().Select(v => v.GetDouble()).ToArray();

    // The fixture's pairs (x, y), (x, z), (y, z), each column shared by two pairs as a feature in several declared pairs is.
    private static readonly (int X, int Y)[] Pairs = [(0, 1), (0, 2), (1, 2)];

    // The columns in batches of 2 100 (a whole slice and a part one), 197 (one row past a register) and 3 rows.
    private static WeightedCorrelation[] Accumulate(double[][] columns, int parallelism, params int[] batches)
    {
        var targets = Pairs.Select(_ => new WeightedCorrelation()).ToArray();
        var moments = new PairBatchMoments();
        var from = 0;
        foreach (var rows in batches)
        {
            var (start, count) = (from, rows);
            var sources = columns.Select(c => (PairBatchMoments.Column)(() => c.AsSpan(start, count))).ToList();
            moments.Add(sources, Pairs.Select((p, k) => (p.X, p.Y, targets[k])).ToList(), count,
                new ParallelOptions { MaxDegreeOfParallelism = parallelism });
            from += rows;
        }
        Assert.Equal(columns[0].Length, from);
        return targets;
    }

    [Theory]
    // Tolerances chosen by us, on each moment relative to its scale n·σ_a^p·σ_b^q and absolute on r. Near zero: a few
    // hundred roundings of a double (seen: 5e-15 on the moments, 4e-16 on r).
    [InlineData("unit_scale", 1e-13, 1e-14)]
    // About ±1e6 with noise of order 1e-2: a batch's mean is a double whose last place (1.2e-10) is 1.2e-8 of the
    // noise, and the pairwise update moves the moments by such errors times the batches' shares (seen: 1.1e-7 on the
    // moments, 6e-11 on r; the earlier per-batch scalar sums gave 3.7e-7 and 2e-10). Each mean is found from
    // deviations from its batch's first value, so the deviations keep their digits; plain one-pass power sums lose
    // them all at this offset.
    [InlineData("offset_1e6", 5e-7, 5e-10)]
    public void Co_moments_agree_with_numpy(string name, double momentTolerance, double rTolerance)
    {
        var c = Case(name);
        var columns = c.GetProperty("columns").EnumerateArray().Select(Doubles).ToArray();
        var n = columns[0].Length;
        var means = Doubles(c.GetProperty("means"));
        var corrcoef = c.GetProperty("corrcoef").EnumerateArray().Select(Doubles).ToArray();
        var cov = c.GetProperty("cov").EnumerateArray().Select(Doubles).ToArray();
        var orders = JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "numpy", "comoments.json")))
            .RootElement.GetProperty("orders").EnumerateArray().Select(o => (P: o[0].GetInt32(), Q: o[1].GetInt32())).ToArray();
        var targets = Accumulate(columns, 2, 2100, 197, n - 2297);
        var fixturePairs = c.GetProperty("pairs").EnumerateArray().ToArray();
        for (var k = 0; k < Pairs.Length; k++)
        {
            var (a, b) = Pairs[k];
            Assert.Equal(a, fixturePairs[k].GetProperty("first").GetInt32());
            Assert.Equal(b, fixturePairs[k].GetProperty("second").GetInt32());
            var target = targets[k];
            // numpy.corrcoef(numpy.vstack([x, y, z]))[a, b].
            Assert.True(Math.Abs(target.Pearson - corrcoef[a][b]) <= rTolerance, $"{name} r {a}~{b}: {target.Pearson:R} vs numpy.corrcoef {corrcoef[a][b]:R}");
            // State: count, Σw², then Σw, the two means and M_20, M_11, M_02, … M_04 (numpy's order above).
            var state = target.State();
            Assert.Equal(n, state[0]);
            Assert.Equal(n, state[2]);
            var (sa, sb) = (Math.Sqrt(cov[a][a]), Math.Sqrt(cov[b][b]));
            // math.fsum(column) / n: each mean within four units in its last place, or the tolerance on the spread.
            foreach (var (mean, reference, spread) in new[] { (state[3], means[a], sa), (state[4], means[b], sb) })
            {
                var ulp = Math.BitIncrement(Math.Abs(reference)) - Math.Abs(reference);
                Assert.True(Math.Abs(mean - reference) <= Math.Max(4 * ulp, momentTolerance * spread), $"{name} mean {mean:R} vs {reference:R}");
            }
            var central = Doubles(fixturePairs[k].GetProperty("central"));
            for (var j = 0; j < orders.Length; j++)
            {
                var scale = n * Math.Pow(sa, orders[j].P) * Math.Pow(sb, orders[j].Q);
                Assert.True(Math.Abs(state[5 + j] - central[j]) <= momentTolerance * scale,
                    $"{name} pair {a}~{b} M_{orders[j].P}{orders[j].Q}: {state[5 + j]:R} vs math.fsum {central[j]:R}");
            }
            // numpy.cov(..., bias=True)[a, b] = M_11 / n.
            Assert.True(Math.Abs(state[6] / n - cov[a][b]) <= momentTolerance * sa * sb, $"{name} cov {a}~{b}");
        }
    }

    /// <summary>
    /// A comparison of the program with itself: the slices' sums are kept apart and added in slice order, so one thread
    /// and several give the same co-moments to the bit (a batch of many slices, its length not a whole register).
    /// </summary>
    [Fact]
    public void Co_moments_do_not_depend_on_the_threads()
    {
        var columns = Case("unit_scale").GetProperty("columns").EnumerateArray().Select(Doubles).ToArray();
        // Nine copies of the columns end to end: one batch of 20 700 rows, eleven slices.
        var long_ = columns.Select(col => Enumerable.Repeat(col, 9).SelectMany(v => v).Select((v, i) => v + 1e-3 * (i % 7)).ToArray()).ToArray();
        var one = Accumulate(long_, 1, long_[0].Length - 3, 3);
        var four = Accumulate(long_, 4, long_[0].Length - 3, 3);
        for (var k = 0; k < Pairs.Length; k++) Assert.Equal(one[k].State(), four[k].State());
    }
}
