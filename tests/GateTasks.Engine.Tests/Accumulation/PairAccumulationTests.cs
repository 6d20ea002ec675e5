using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>
/// The declared pairs' batched fill (<see cref="PairAccumulation"/>: cells and ranks found once per feature and batch,
/// the 2-D grid filled from those cells) against the pair-by-pair definition — ranks by <see cref="MarginalCdf.Evaluate"/>,
/// each pair without NaN added alone, each 2-D cell found by <see cref="Histogram2D.Fill(double, double, double)"/>.
/// A comparison of the program with itself: the batched fill must give the same numbers to the bit, except the
/// co-moments of unit-weight batches without NaN, summed in another order (to rounding).
/// </summary>
public class PairAccumulationTests
{
    private static readonly SourceLocation At = new("pairs.yaml", 1, 1);

    private static (double[][] Features, double[] Weights, Histogram[] References) Data(int rows, bool nan)
    {
        var random = new Random(20_261_203);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
        var features = new double[3][];
        for (var f = 0; f < 3; f++) features[f] = new double[rows];
        var weights = new double[rows];
        for (var r = 0; r < rows; r++)
        {
            var u = Normal();
            features[0][r] = u;
            features[1][r] = 0.6 * u + 0.8 * Normal();
            // On a regular axis, with values on its edges and outside it.
            features[2][r] = r % 17 == 0 ? Math.Round(4 * Normal()) / 2 : 2 * random.NextDouble() - 1.2;
            weights[r] = r % 5 == 0 ? -0.5 : 0.5 + random.NextDouble();
            if (nan && r % 13 == 0) features[r % 3][r] = double.NaN;
        }
        // Equal-probability edges for the first two (a variable axis), 20 regular bins on [-1, 1] for the third; some
        // sample values fall exactly on edges.
        Histogram Quantile(double[] v)
        {
            var sorted = v.Where(double.IsFinite).Order().ToArray();
            var edges = Enumerable.Range(0, 31).Select(k => sorted[Math.Min(sorted.Length - 1, k * sorted.Length / 30)]).Distinct().ToArray();
            var h = new Histogram(new VariableAxis(edges));
            h.Fill(sorted, ReadOnlySpan<double>.Empty);
            return h;
        }
        var regular = new Histogram(new RegularAxis(20, -1, 1));
        regular.Fill(features[2].Where(double.IsFinite).ToArray(), ReadOnlySpan<double>.Empty);
        return (features, weights, [Quantile(features[0]), Quantile(features[1]), regular]);
    }

    [Theory]
    [InlineData(false, false)]
    [InlineData(true, false)]
    [InlineData(false, true)]
    [InlineData(true, true)]
    public void Batched_fill_gives_the_pair_by_pair_numbers(bool weighted, bool nan)
    {
        const int rows = 5000;
        var (features, weights, references) = Data(rows, nan);
        var chi2 = new GoodnessOfFitTest(CheckKind.ChiSquareTest, At);
        // A pair on the map grid, one on the features' own axes (χ² test), and a third sharing their features.
        CorrelationSpec[] specs = [new("a", "b", null, null, At), new("a", "c", null, null, At, chi2), new("b", "c", null, null, At)];
        var index = new Dictionary<string, int> { ["a"] = 0, ["b"] = 1, ["c"] = 2 };
        var set = new PairAccumulation(specs, index, i => references[i]);
        // Two batches of different sizes, as a stream gives them.
        foreach (var (from, count) in new[] { (0, 3000), (3000, 2000) })
        {
            var batch = features.Select(f => f.AsSpan(from, count).ToArray()).ToArray();
            var view = new FeatureView(batch, weights.AsSpan(from, count).ToArray(), weighted, new long[count]) { Rows = count };
            set.Add(view);
        }

        foreach (var (spec, pair) in specs.Zip(set.Pairs))
        {
            var (i, j) = (index[spec.First], index[spec.Second]);
            var (cdfI, cdfJ) = (new MarginalCdf(references[i]), new MarginalCdf(references[j]));
            var joint = PairGrid.For(spec, references[i].Axis, references[j].Axis);
            // Each batch's pairs without NaN added as one batch, into one accumulation, as a stream adds them.
            var (p, s) = (new WeightedCorrelation(), new WeightedCorrelation());
            var cells = new ExactCells(joint.CellCount);
            foreach (var (from, count) in new[] { (0, 3000), (3000, 2000) })
            {
                var (x, y, u, v, w) = (new List<double>(), new List<double>(), new List<double>(), new List<double>(), new List<double>());
                for (var r = from; r < from + count; r++)
                {
                    if (double.IsNaN(features[i][r]) || double.IsNaN(features[j][r])) continue;
                    x.Add(features[i][r]);
                    y.Add(features[j][r]);
                    u.Add(cdfI.Evaluate(features[i][r]));
                    v.Add(cdfJ.Evaluate(features[j][r]));
                    w.Add(weighted ? weights[r] : 1.0);
                    joint.Fill(features[i][r], features[j][r], weighted ? weights[r] : 1.0);
                }
                var ws = weighted ? w.ToArray() : [];
                p.AddBatch(x.ToArray(), y.ToArray(), ws);
                s.AddBatch(u.ToArray(), v.ToArray(), ws);
                joint.MoveCellsInto(cells);
            }
            if (weighted || nan)
            {
                // Every co-moment to the bit: these batches take the per-pair loop.
                Assert.Equal(p.Pearson, pair.Pearson);
                Assert.Equal(s.Pearson, pair.Spearman);
                Assert.Equal(p.State(), pair.State().Pearson);
                Assert.Equal(s.State(), pair.State().Spearman);
            }
            else
            {
                // Unit weights without NaN: the batch's sums run over events in SIMD registers (PairBatchMomentsTests
                // checks them against numpy), another order of additions, so the same numbers to rounding (a bound of
                // ours: 1e-12 of each number's scale).
                AssertClose(p.State(), pair.State().Pearson);
                AssertClose(s.State(), pair.State().Spearman);
                Assert.InRange(pair.Pearson - p.Pearson, -1e-13, 1e-13);
                Assert.InRange(pair.Spearman - s.Pearson, -1e-13, 1e-13);
            }
            Assert.Equal(p.EffectiveCount, pair.EffectiveCount);
            var finished = pair.Finish().Cells!;
            Assert.Equal(cells.SumW(), finished.SumW);
            Assert.Equal(cells.SumW2(), finished.SumW2);
        }
    }

    // Each number of a WeightedCorrelation state (count, Σw², then per sign of weight Σw, the means and M_20 … M_04)
    // within 1e-12 of its scale: the counts themselves, σ for a mean, Σw·σ_x^p·σ_y^q for M_pq.
    private static void AssertClose(IReadOnlyList<double> expected, IReadOnlyList<double> actual)
    {
        (int P, int Q)[] orders = [(2, 0), (1, 1), (0, 2), (3, 0), (2, 1), (1, 2), (0, 3), (4, 0), (3, 1), (2, 2), (1, 3), (0, 4)];
        Assert.Equal(expected.Count, actual.Count);
        for (var k = 0; k < expected.Count; k++)
        {
            var (part, j) = k < 2 ? (-1, k) : ((k - 2) / CoMoments.StateLength, (k - 2) % CoMoments.StateLength);
            var at = 2 + Math.Max(part, 0) * CoMoments.StateLength;
            var w = expected[at];
            var (sx, sy) = w == 0 ? (0, 0) : (Math.Sqrt(expected[at + 3] / w), Math.Sqrt(expected[at + 5] / w));
            var scale = part < 0 || j == 0 ? Math.Abs(expected[k]) : j == 1 ? sx : j == 2 ? sy
                : Math.Abs(w) * Math.Pow(sx, orders[j - 3].P) * Math.Pow(sy, orders[j - 3].Q);
            Assert.True(Math.Abs(expected[k] - actual[k]) <= 1e-12 * scale, $"state[{k}]: {actual[k]:R} vs {expected[k]:R}");
        }
    }

    [Fact]
    public void Ranks_from_cells_are_the_searched_ranks()
    {
        var (features, _, references) = Data(3000, false);
        foreach (var (values, reference) in features.Zip(references))
        {
            var cdf = new MarginalCdf(reference);
            // The sample's values, every edge, and values just off the edges and outside the axis.
            var edges = reference.Axis.Edges.ToArray();
            var probes = values.Concat(edges).Concat(edges.Select(Math.BitDecrement)).Concat(edges.Select(Math.BitIncrement))
                .Append(edges[0] - 1).Append(edges[^1] + 1).ToArray();
            var cells = new int[probes.Length];
            reference.Axis.Cells(probes, cells, -1);
            for (var k = 0; k < probes.Length; k++) Assert.Equal(cdf.Evaluate(probes[k]), cdf.Rank(probes[k], cells[k]));
        }
    }
}
