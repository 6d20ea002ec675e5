using GateTasks.Engine.Statistics;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Statistics;

/// <summary>
/// The three fine-grid distances of a bootstrap replica computed side by side against each computed alone: the program
/// compared with itself. The lanes must repeat the single computation's operations, so every bit must agree.
/// </summary>
public class WassersteinThreeTests
{
    [Theory]
    [InlineData(4_105, 1)]
    [InlineData(41, 2)]
    [InlineData(2, 3)]
    public void Three_distances_at_once_have_the_bits_of_each_alone(int edgeCount, int seed)
    {
        var rng = new Xoshiro256StarStar(seed);
        var edges = new double[edgeCount];
        edges[0] = -3;
        for (var i = 1; i < edgeCount; i++) edges[i] = edges[i - 1] + Math.Exp(3 * rng.NextDouble() - 4);
        // Cells close to each other, so the CDFs cross often and both forms of the |d| mean are taken.
        double[] Packed(double[] shape, double noise) =>
            [rng.NextDouble(), .. shape.Select(s => Math.Max(0, s + noise * (rng.NextDouble() - 0.5))), rng.NextDouble()];
        var shape = Enumerable.Range(0, edgeCount + 1).Select(_ => 50 + 10 * rng.NextDouble()).ToArray();
        for (var replica = 0; replica < 20; replica++)
        {
            var p = Enumerable.Range(0, 6).Select(_ => Packed(shape, 8)).ToArray();
            double One(double[] a, double[] b) => Wasserstein.FineGrid(edges, a.AsSpan(1, a.Length - 2), a[0], a[^1], b.AsSpan(1, b.Length - 2), b[0], b[^1]);
            var (x, y, z) = Wasserstein.FineGridThree(edges, p[0], p[1], p[2], p[3], p[4], p[5]);
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[0], p[1])), BitConverter.DoubleToInt64Bits(x));
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[2], p[3])), BitConverter.DoubleToInt64Bits(y));
            Assert.Equal(BitConverter.DoubleToInt64Bits(One(p[4], p[5])), BitConverter.DoubleToInt64Bits(z));
        }
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
