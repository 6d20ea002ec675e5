using GateTasks.Engine.Statistics;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.References;
using MathNet.Numerics.Random;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

/// <summary>
/// The three (and four) fine-grid distances of bootstrap replicas computed side by side against each computed alone: the
/// program compared with itself. The lanes must repeat the single computation's operations, so every bit must agree.
/// The four lanes are also checked against scipy's unbinned W₁ (the long-tail fixture of <see cref="WassersteinTests"/>).
/// </summary>
public class WassersteinThreeTests
{
    /// <summary>
    /// Random fine-grid edges and 20 replicas of <paramref name="count"/> packed cell arrays (below moment, cells, above
    /// moment), drawn in the order the two lane tests drew them before they shared this.
    /// </summary>
    private static (double[] Edges, double[][][] Replicas) Replicas(int edgeCount, int seed, int count)
    {
        var rng = new Xoshiro256StarStar(seed);
        var edges = new double[edgeCount];
        edges[0] = -3;
        for (var i = 1; i < edgeCount; i++) edges[i] = edges[i - 1] + Math.Exp(3 * rng.NextDouble() - 4);
        // Cells close to each other, so the CDFs cross often and both forms of the |d| mean are taken.
        double[] Packed(double[] shape, double noise) =>
            [rng.NextDouble(), .. shape.Select(s => Math.Max(0, s + noise * (rng.NextDouble() - 0.5))), rng.NextDouble()];
        var shape = Enumerable.Range(0, edgeCount + 1).Select(_ => 50 + 10 * rng.NextDouble()).ToArray();
        var replicas = new double[20][][];
        for (var r = 0; r < replicas.Length; r++) replicas[r] = Enumerable.Range(0, count).Select(_ => Packed(shape, 8)).ToArray();
        return (edges, replicas);
    }

    [Theory]
    [InlineData(4_105, 1)]
    [InlineData(41, 2)]
    [InlineData(2, 3)]
    public void Three_distances_at_once_have_the_bits_of_each_alone(int edgeCount, int seed)
    {
        var (edges, replicas) = Replicas(edgeCount, seed, 6);
        foreach (var p in replicas)
        {
            double One(double[] a, double[] b) => Wasserstein.FineGrid(edges, a.AsSpan(1, a.Length - 2), a[0], a[^1], b.AsSpan(1, b.Length - 2), b[0], b[^1]);
            var (x, y, z) = Wasserstein.FineGridThree(edges, p[0], p[1], p[2], p[3], p[4], p[5]);
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[0], p[1])), BitConverter.DoubleToInt64Bits(x));
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[2], p[3])), BitConverter.DoubleToInt64Bits(y));
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[4], p[5])), BitConverter.DoubleToInt64Bits(z));
        }
    }

    [Theory]
    [InlineData(4_105, 4)]
    [InlineData(41, 5)]
    [InlineData(2, 6)]
    public void Four_distances_at_once_have_the_bits_of_each_alone(int edgeCount, int seed)
    {
        // The program compared with itself, as above, with four different pairs.
        var (edges, replicas) = Replicas(edgeCount, seed, 8);
        foreach (var p in replicas)
        {
            double One(double[] a, double[] b) => Wasserstein.FineGrid(edges, a.AsSpan(1, a.Length - 2), a[0], a[^1], b.AsSpan(1, b.Length - 2), b[0], b[^1]);
            var (w, x, y, z) = Wasserstein.FineGridFour(edges, p[0], p[1], p[2], p[3], p[4], p[5], p[6], p[7]);
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[0], p[1])), BitConverter.DoubleToInt64Bits(w));
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[2], p[3])), BitConverter.DoubleToInt64Bits(x));
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[4], p[5])), BitConverter.DoubleToInt64Bits(y));
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[6], p[7])), BitConverter.DoubleToInt64Bits(z));
        }
    }

    [Theory]
    [InlineData("lognormal_scale_1.015")]
    [InlineData("pareto_same_law")]
    [InlineData("exponential_scale_1.02")]
    public void Four_lanes_agree_with_scipy_on_long_tailed_samples(string name)
    {
        var c = Case("wasserstein_long_tail", name);
        var u = c.Doubles("u");
        var v = c.Doubles("v");
        // Both samples on the reference's fine grid, as a reference build and a check gather them.
        var grid = new QuantileGrid(u.Min(), u.Max());
        grid.Fine.Fill(u, []);
        var edges = grid.FineEdges(ReferenceBuilder.FineGridBins, ReferenceBuilder.FineGridTailLevels);
        var reference = new FineGridCounter(edges);
        var sample = new FineGridCounter(edges);
        reference.Add(u, []);
        sample.Add(v, []);
        var a = reference.Finish();
        var b = sample.Finish();
        double[] Packed(FineGridCells g) => [g.BelowMoment, .. g.SumW, g.AboveMoment];
        var (pa, pb) = (Packed(a), Packed(b));
        var (ab, ba, aa, bb) = Wasserstein.FineGridFour(a.Edges, pa, pb, pb, pa, pa, pa, pb, pb);
        // scipy 1.10.1 scipy.stats.wasserstein_distance(u, v) on the same unbinned values (call in the fixture's
        // generator, tests/fixtures/scipy/make_fixtures.py), wasserstein_long_tail/<name>: within 5%, as for one distance.
        Near(c.Double("distance"), ab, 0.05);
        Near(c.Double("distance"), ba, 0.05);
        // A sample against itself: zero (the definition of a distance).
        Assert.Equal(0, aa);
        Assert.Equal(0, bb);
    }

    [Fact]
    public void An_empty_grid_is_refused_as_one_distance_refuses_it()
    {
        double[] edges = [0, 1];
        double[] empty = [0, 0, 0, 0, 0];
        double[] some = [0, 1, 1, 1, 0];
        Assert.Throws<ArgumentException>(() => Wasserstein.FineGridThree(edges, some, some, empty, some, some, some));
    }
}
