using GateTasks.Engine.Accumulation;
using GateTasks.Engine.References;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>
/// The streamed sliced fill (vector projection, table lookup, counts for unit weights added when read) against the fill
/// as first written, row by row (<see cref="RowByRowSlicedCounter"/>). These compare the program with itself: the
/// state, every exact sum's terms included, must be the same to the bit.
/// </summary>
public sealed class SlicedHistogramCounterTests
{
    private static double[][] Columns(int rows, int d, int seed, bool awkward)
    {
        var rng = new Random(seed);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
        var columns = Enumerable.Range(0, d).Select(_ => new double[rows]).ToArray();
        for (var r = 0; r < rows; r++)
            for (var j = 0; j < d; j++)
                columns[j][r] = j switch
                {
                    0 => Normal(),
                    1 => Math.Exp(1.5 * Normal()),                           // long right tail
                    2 => Math.Tan(Math.PI * (rng.NextDouble() - 0.5)),       // Cauchy: very long tails both ways
                    3 => rng.Next(3) - 1.0,                                  // ties, exact zeros
                    _ => (float)Normal(),
                };
        if (awkward)
        {
            // Rows a sample may hold: non-finite values (skipped), −0 beside +0, values far beyond the reference.
            for (var r = 0; r < rows; r += 97) columns[r % d][r] = r % 3 == 0 ? double.NaN : r % 3 == 1 ? double.PositiveInfinity : double.NegativeInfinity;
            for (var r = 5; r < rows; r += 53) columns[3 % d][r] = -0.0;
            for (var r = 7; r < rows; r += 211) columns[0][r] = 1e6 * (r % 2 == 0 ? 1 : -1);
        }
        return columns;
    }

    private static (SlicedProjection Projection, double[][] Edges) Grid(int d, int k, int seed)
    {
        var reference = Columns(20_000, d, seed, awkward: false);
        var names = Enumerable.Range(0, d).Select(j => $"f{j}").ToArray();
        var means = reference.Select(c => c.Average()).ToArray();
        var sds = reference.Select((c, j) => Math.Sqrt(c.Sum(v => (v - means[j]) * (v - means[j])) / c.Length)).ToArray();
        var projection = new SlicedProjection(SlicedDirections.Draw(names, k), means, sds);
        var builder = new SlicedGridBuilder(projection, reference.Select(c => c.Min()).ToArray(), reference.Select(c => c.Max()).ToArray());
        builder.Add(reference, []);
        return (projection, builder.Edges(cells: 64, tailLevels: 3));
    }

    private static double[] Weights(int rows, int seed)
    {
        var rng = new Random(seed);
        return Enumerable.Range(0, rows).Select(_ => rng.NextDouble() < 0.1 ? -0.3 * rng.NextDouble() : 0.2 + 3 * rng.NextDouble()).ToArray();
    }

    private static double[][] Slice(double[][] columns, int start, int n) => columns.Select(c => c.AsSpan(start, n).ToArray()).ToArray();

    private static void AssertSameState(SlicedHistogramState expected, SlicedHistogramState actual)
    {
        Assert.Equal(expected.Groups, actual.Groups);
        Assert.Equal(expected.Rows, actual.Rows);
        Assert.Equal(expected.Skipped, actual.Skipped);
        foreach (var (e, a) in new[] { (expected.GroupCells, actual.GroupCells), (expected.CellSquares, actual.CellSquares), (expected.Moments, actual.Moments) })
        {
            Assert.Equal(e.High.Select(BitConverter.DoubleToInt64Bits), a.High.Select(BitConverter.DoubleToInt64Bits));
            Assert.Equal(e.Low.Select(BitConverter.DoubleToInt64Bits), a.Low.Select(BitConverter.DoubleToInt64Bits));
            Assert.Equal(e.Spilled.Count, a.Spilled.Count);
            for (var i = 0; i < e.Spilled.Count; i++)
            {
                Assert.Equal(e.Spilled[i].Index, a.Spilled[i].Index);
                Assert.Equal(e.Spilled[i].Terms.Select(BitConverter.DoubleToInt64Bits), a.Spilled[i].Terms.Select(BitConverter.DoubleToInt64Bits));
            }
        }
    }

    [Theory]
    [InlineData(5, 64, false, 1)]
    [InlineData(5, 64, true, 2)]
    [InlineData(20, 13, false, 3)]
    [InlineData(20, 13, true, 4)]
    [InlineData(2, 3, true, 5)]
    [InlineData(1, 1, false, 6)]
    public void Batches_give_the_row_by_row_state_to_the_bit(int d, int k, bool weighted, int seed)
    {
        var (projection, edges) = Grid(d, k, seed);
        var rows = 9_000;
        var columns = Columns(rows, d, seed + 100, awkward: true);
        var weights = weighted ? Weights(rows, seed) : [];
        var fast = new SlicedHistogramCounter(projection, edges);
        var plain = new RowByRowSlicedCounter(projection, edges);
        // Batches of awkward sizes: below a chunk, across blocks, one row.
        var start = 0;
        foreach (var n in new[] { 1, 200, 2_500, 4_299, 2_000 })
        {
            var part = Slice(columns, start, n);
            var w = weighted ? weights.AsSpan(start, n).ToArray() : [];
            fast.Add(part, w);
            plain.Add(SlicedRows.View(part, w), Enumerable.Range(0, d).ToArray());
            start += n;
        }
        AssertSameState(plain.State(), fast.State());
        var a = plain.Finish();
        var b = fast.Finish();
        for (var p = 0; p < k; p++)
        {
            Assert.Equal(a.Cells[p], b.Cells[p]);
            Assert.Equal(a.Squares[p], b.Squares[p]);
            for (var g = 0; g < a.Groups; g++) Assert.Equal(a.GroupCells[p][g], b.GroupCells[p][g]);
        }
        Assert.Equal(a.Mean, b.Mean);
        Assert.Equal(a.StandardDeviation, b.StandardDeviation);
    }

    [Fact]
    public void Unit_weights_then_weights_then_merges_and_states_give_the_row_by_row_state()
    {
        const int d = 4, k = 9;
        var (projection, edges) = Grid(d, k, 11);
        var columns = Columns(6_000, d, 12, awkward: true);
        var weights = Weights(6_000, 13);
        var features = Enumerable.Range(0, d).ToArray();
        SlicedHistogramCounter Fast() => new(projection, edges);
        RowByRowSlicedCounter Plain() => new(projection, edges);

        // One counter: unit weights, then weights, then unit weights again.
        var fast = Fast();
        var plain = Plain();
        foreach (var (start, n, w) in new[] { (0, 1_500, false), (1_500, 1_500, true), (3_000, 3_000, false) })
        {
            var part = Slice(columns, start, n);
            var ws = w ? weights.AsSpan(start, n).ToArray() : [];
            fast.Add(part, ws);
            plain.Add(SlicedRows.View(part, ws), features);
        }
        AssertSameState(plain.State(), fast.State());

        // Shards: two counters merged, a state added to a fresh one, and more rows after the merge.
        var f1 = Fast();
        var f2 = Fast();
        var p1 = Plain();
        var p2 = Plain();
        f1.Add(Slice(columns, 0, 2_000), []);
        p1.Add(SlicedRows.View(Slice(columns, 0, 2_000), []), features);
        f2.Add(Slice(columns, 2_000, 2_000), []);
        p2.Add(SlicedRows.View(Slice(columns, 2_000, 2_000), []), features);
        f1.Merge(f2);
        p1.Merge(p2);
        f1.Add(Slice(columns, 4_000, 2_000), []);
        p1.Add(SlicedRows.View(Slice(columns, 4_000, 2_000), []), features);
        AssertSameState(p1.State(), f1.State());
        var f3 = Fast();
        Assert.True(f3.AddState(f1.State()));
        f3.Add(Slice(columns, 0, 700), []);
        var p3 = Plain();
        Assert.True(p3.AddState(p1.State()));
        p3.Add(SlicedRows.View(Slice(columns, 0, 700), []), features);
        AssertSameState(p3.State(), f3.State());
    }

    [Theory]
    [InlineData(1, 1)]
    [InlineData(2, 3)]
    [InlineData(20, 64)]
    [InlineData(7, 37)]
    [InlineData(3, 67)]
    public void Rows_project_as_one_row_does_to_the_bit(int d, int k)
    {
        var rng = new Random(d * 100 + k);
        var names = Enumerable.Range(0, d).Select(j => $"g{j}").ToArray();
        var directions = SlicedDirections.Draw(names, k);
        if (d > 1) directions[d + 1 < directions.Length ? d + 1 : 0] = 0; // a zero component is skipped, not added as ±0
        var projection = new SlicedProjection(directions, Enumerable.Range(0, d).Select(_ => rng.NextDouble()).ToArray(),
            Enumerable.Range(0, d).Select(_ => 0.1 + rng.NextDouble()).ToArray());
        var plain = new SlicedProjection(SlicedDirections.Draw(names, k), Enumerable.Repeat(0.25, d).ToArray(), Enumerable.Repeat(3.0, d).ToArray());
        foreach (var proj in new[] { projection, plain })
        {
            const int rows = 19;
            var columns = Enumerable.Range(0, d).Select(_ => Enumerable.Range(0, rows).Select(_ => (rng.NextDouble() - 0.5) * Math.Pow(10, rng.Next(-5, 6))).ToArray()).ToArray();
            columns[0][3] = -0.0;
            var stride = k + 5;
            var output = new double[rows * stride];
            proj.ProjectRows(columns, 0, rows, output, stride);
            var tail = new double[2 * stride];
            proj.ProjectRows(columns, rows - 2, 2, tail, stride);
            Assert.Equal(output.AsSpan((rows - 2) * stride, stride + k).ToArray(), tail.AsSpan(0, stride + k).ToArray());
            for (var r = 0; r < rows; r++)
            {
                var row = columns.Select(c => c[r]).ToArray();
                for (var p = 0; p < k; p++)
                {
                    Assert.Equal(BitConverter.DoubleToInt64Bits(proj.ProjectRow(row, p)), BitConverter.DoubleToInt64Bits(output[r * stride + p]));
                }
            }
        }
    }
}
