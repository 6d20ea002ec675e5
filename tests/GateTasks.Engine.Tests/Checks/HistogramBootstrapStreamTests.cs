using GateTasks.Engine.Checks;
using GateTasks.Engine.Statistics;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// The distance bootstraps' numbers must not change when their code is made faster: the same seeds, the same draws per
/// cell and replica, the same summation order. These tests compare the program with itself — with and without the
/// four-lane distance, and against numbers frozen from the build before the bootstraps' draws were inlined and their
/// distances batched (printed by this same test, run against that build's code, then pasted) — not with an outside source; the
/// laws of the draws are checked against MathNet in SeededSamplerTests, the distances against scipy in WassersteinTests
/// and WassersteinThreeTests.
/// </summary>
public sealed class HistogramBootstrapStreamTests(Xunit.Abstractions.ITestOutputHelper output)
{
    private const int Cells = 1_025; // 1 023 cells between 1 024 edges and the two flows; packed with the two tail moments

    /// <summary>
    /// A reference of a few hundred events a cell (drawn by PTRS) against a sparse sample of under one a cell (by the
    /// product of uniforms), a few of its cells empty (held), a few with unequal weights: each path of the draws is taken.
    /// </summary>
    private static (double[] Edges, CellContents Reference, CellContents Sample) Input()
    {
        var rng = new Xoshiro256StarStar(11);
        var edges = new double[Cells - 1];
        edges[0] = -3;
        for (var i = 1; i < edges.Length; i++) edges[i] = edges[i - 1] + Math.Exp(2 * rng.NextDouble() - 6);
        var refW = new double[Cells + 2];
        var refW2 = new double[Cells + 2];
        var samW = new double[Cells + 2];
        var samW2 = new double[Cells + 2];
        for (var i = 0; i < refW.Length; i++)
        {
            refW[i] = Math.Floor(150 + 200 * rng.NextDouble());
            refW2[i] = refW[i] * (i % 7 == 0 ? 1.5 : 1);
            samW[i] = rng.NextDouble() < 0.3 ? 0 : Math.Floor(1 + 3 * rng.NextDouble());
            samW2[i] = samW[i] * (i % 5 == 0 ? 2 : 1);
        }
        return (edges, new CellContents(refW, refW2), new CellContents(samW, samW2));
    }

    private static double Distance(double[] edges, double[] a, double[] b) =>
        Wasserstein.FineGrid(edges, a.AsSpan(1, a.Length - 2), a[0], a[^1], b.AsSpan(1, b.Length - 2), b[0], b[^1]);

    private static ulong Digest(IEnumerable<double> values)
    {
        // FNV-1a over the values' bits: one number that changes if any bit of any value does.
        var h = 14695981039346656037UL;
        foreach (var v in values)
        {
            h ^= (ulong)BitConverter.DoubleToInt64Bits(v);
            h *= 1099511628211UL;
        }
        return h;
    }

    private static (HistogramBootstrap.Noise Noise, double[] Boundary) Run(bool lanes)
    {
        var (edges, reference, sample) = Input();
        double D(double[] a, double[] b) => Distance(edges, a, b);
        var estimate = D(reference.SumW, sample.SumW);
        ThreeDistances? three = lanes ? (a0, b0, a1, b1, a2, b2) => Wasserstein.FineGridThree(edges, a0, b0, a1, b1, a2, b2) : null;
        FourDistances? four = lanes ? (a0, b0, a1, b1, a2, b2, a3, b3) => Wasserstein.FineGridFour(edges, a0, b0, a1, b1, a2, b2, a3, b3) : null;
        var noise = HistogramBootstrap.StandardErrorsAndBias(reference, sample, D, estimate, 20_261_204, three);
        var boundary = HistogramBootstrap.BoundaryReplicas(reference, sample, D, estimate, estimate / 3, 20_261_204, four)
            ?? throw new InvalidOperationException("the estimate should exceed the tolerance");
        return (noise, boundary);
    }

    [Fact]
    public void Replicas_measured_four_at_a_time_have_the_bits_of_each_alone()
    {
        var (alone, aloneBoundary) = Run(lanes: false);
        var (together, togetherBoundary) = Run(lanes: true);
        Assert.Equal(alone, together);
        Assert.Equal(aloneBoundary.Select(BitConverter.DoubleToInt64Bits), togetherBoundary.Select(BitConverter.DoubleToInt64Bits));
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void The_numbers_are_those_of_the_build_before_the_draws_were_inlined(bool lanes)
    {
        var (noise, boundary) = Run(lanes);
        output.WriteLine($"{noise.Errors.Total:R} {noise.Errors.Reference:R} {noise.Errors.Surrogate:R} {noise.Bias:R} {boundary.Average():R} {Digest(boundary)}");
        // Frozen from the build before this change (the program compared with an earlier version of itself).
        Assert.Equal(FrozenTotal, noise.Errors.Total);
        Assert.Equal(FrozenReference, noise.Errors.Reference);
        Assert.Equal(FrozenSurrogate, noise.Errors.Surrogate);
        Assert.Equal(FrozenBias, noise.Bias);
        Assert.Equal(FrozenBoundaryMean, boundary.Average());
        Assert.Equal(FrozenBoundaryDigest, Digest(boundary));
    }

    private const double FrozenTotal = 0.04849200706483737, FrozenReference = 0.004482257683501317, FrozenSurrogate = 0.048284408614323225,
        FrozenBias = 0.013625189775282154, FrozenBoundaryMean = 0.07799521448550946;
    private const ulong FrozenBoundaryDigest = 2460531270548692296;
}
