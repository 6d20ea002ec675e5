using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Wasserstein-1 (earth mover's) distance between two one-dimensional distributions,
/// W₁ = ∫ |F(t) − G(t)| dt (Vallender 1974 for the CDF form), between two histograms on the same edges.
/// </summary>
internal static class Wasserstein
{
    /// <summary>
    /// W₁ between two histograms on the same bin edges, taking each bin's content as spread uniformly over
    /// the bin: both CDFs are then piecewise linear through the edges and |F − G| is integrated exactly over
    /// [edges[0], edges[^1]] (in axis units). Contents are normalised to unit mass; under/overflow are not
    /// part of the axis and must be left out.
    /// </summary>
    internal static double Histograms(ReadOnlySpan<double> edges, ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        KernelPreconditions.RequireSameLength(a.Length, b.Length, nameof(a), nameof(b));
        if (edges.Length != a.Length + 1)
            throw new ArgumentException($"{a.Length} bins need {a.Length + 1} edges, got {edges.Length}.", nameof(edges));
        KernelPreconditions.RequireFinite(edges, nameof(edges));
        for (int i = 1; i < edges.Length; i++)
        {
            if (!(edges[i] > edges[i - 1]))
                throw new ArgumentException($"Bin edges must increase strictly (edges[{i}]).", nameof(edges));
        }
        double ta = KernelPreconditions.RequireContents(a, nameof(a));
        double tb = KernelPreconditions.RequireContents(b, nameof(b));
        double ca = 0, cb = 0, area = 0;
        for (int i = 0; i < a.Length; i++)
        {
            double d0 = ca / ta - cb / tb;
            ca += a[i];
            cb += b[i];
            double d1 = ca / ta - cb / tb;
            double width = edges[i + 1] - edges[i];
            area += width * LinearAbsMean(d0, d1);
        }
        return area;
    }

    /// <summary>Mean of |d(t)| for d linear from d0 to d1 on [0, 1], splitting at the sign change.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static double LinearAbsMean(double d0, double d1)
    {
        if (d0 * d1 >= 0)
            return (Math.Abs(d0) + Math.Abs(d1)) / 2;
        return (d0 * d0 + d1 * d1) / (2 * (Math.Abs(d0) + Math.Abs(d1)));
    }

    /// <summary>
    /// W₁ between two samples gathered on one fine grid of edges (a few thousand equal-probability cells): the cells
    /// <paramref name="a"/> and <paramref name="b"/> hold the underflow first and the overflow last (edges.Length + 1),
    /// each sample's weight spread uniformly within a cell as in <see cref="Histograms"/>; beyond the outermost edges
    /// the tails' first moments (Σw·(e₀ − x) below, Σw·(x − e_last) above) give ∫F dt and ∫(1 − F) dt exactly, and
    /// |F − G| is integrated there as the difference of these integrals — exact where F − G keeps its sign in the
    /// tail, as it does when the edges span one of the samples. Cells may hold signed weights; each total must be
    /// positive.
    /// </summary>
    internal static double FineGrid(ReadOnlySpan<double> edges, ReadOnlySpan<double> a, double belowA, double aboveA,
        ReadOnlySpan<double> b, double belowB, double aboveB)
    {
        KernelPreconditions.RequireSameLength(a.Length, b.Length, nameof(a), nameof(b));
        if (edges.Length < 2 || a.Length != edges.Length + 1)
            throw new ArgumentException($"{edges.Length} edges need {edges.Length + 1} cells (flows included), got {a.Length}.", nameof(edges));
        double ta = 0, tb = 0;
        for (var i = 0; i < a.Length; i++)
        {
            ta += a[i];
            tb += b[i];
        }
        if (!(ta > 0) || !(tb > 0) || !double.IsFinite(ta) || !double.IsFinite(tb))
            throw new ArgumentException("Each sample's total weight on the grid must be positive and finite.", nameof(a));
        double ca = a[0], cb = b[0];
        // Multiplied by the totals' reciprocals rather than divided (the bootstraps evaluate this hundreds of times per
        // check over thousands of cells): a difference in the last bits only.
        double ia = 1 / ta, ib = 1 / tb;
        var area = Math.Abs(belowA * ia - belowB * ib);
        // Each cell's d1 is the next cell's d0, so it is carried rather than computed twice.
        var d0 = ca * ia - cb * ib;
        for (var i = 1; i < edges.Length; i++)
        {
            ca += a[i];
            cb += b[i];
            var d1 = ca * ia - cb * ib;
            area += (edges[i] - edges[i - 1]) * LinearAbsMean(d0, d1);
            d0 = d1;
        }
        return area + Math.Abs(aboveA * ia - aboveB * ib);
    }

    /// <summary>
    /// Three <see cref="FineGrid"/> distances at once, D(a₀, b₀), D(a₁, b₁) and D(a₂, b₂), each pair packed as
    /// [tail moment below, cells (flows included), tail moment above]: what a bootstrap replica asks for (the reference
    /// redrawn, the sample redrawn, both). <see cref="FineGridFour"/> with its last lane a copy of the third: every
    /// result has <see cref="FineGrid"/>'s bits.
    /// </summary>
    internal static (double First, double Second, double Third) FineGridThree(ReadOnlySpan<double> edges,
        double[] a0, double[] b0, double[] a1, double[] b1, double[] a2, double[] b2)
    {
        var (first, second, third, _) = FineGridFour(edges, a0, b0, a1, b1, a2, b2, a2, b2);
        return (first, second, third);
    }

    /// <summary>
    /// Four <see cref="FineGrid"/> distances at once, D(a₀, b₀) … D(a₃, b₃), each pair packed as [tail moment below,
    /// cells (flows included), tail moment above]: a bootstrap's replicas taken four at a time. The four run side by side
    /// in the lanes of one SIMD register, each lane doing <see cref="FineGrid"/>'s operations in its order, and
    /// <see cref="LinearAbsMean"/>'s two forms are both computed and one selected (no branch on where the CDFs cross):
    /// every result has <see cref="FineGrid"/>'s bits.
    /// </summary>
    internal static (double First, double Second, double Third, double Fourth) FineGridFour(ReadOnlySpan<double> edges,
        double[] a0, double[] b0, double[] a1, double[] b1, double[] a2, double[] b2, double[] a3, double[] b3)
    {
        static double One(ReadOnlySpan<double> edges, double[] a, double[] b) =>
            FineGrid(edges, a.AsSpan(1, a.Length - 2), a[0], a[^1], b.AsSpan(1, b.Length - 2), b[0], b[^1]);
        (double, double, double, double) Alone(ReadOnlySpan<double> edges) =>
            (One(edges, a0, b0), One(edges, a1, b1), One(edges, a2, b2), One(edges, a3, b3));
        var cells = edges.Length + 1;
        if (!Vector256.IsHardwareAccelerated || edges.Length < 2
            || a0.Length != cells + 2 || a1.Length != cells + 2 || a2.Length != cells + 2 || a3.Length != cells + 2
            || b0.Length != cells + 2 || b1.Length != cells + 2 || b2.Length != cells + 2 || b3.Length != cells + 2)
            return Alone(edges);
        // Every index below lies in [0, cells + 1], checked by the lengths above, so the arrays are read unchecked.
        ref var pa0 = ref MemoryMarshal.GetArrayDataReference(a0);
        ref var pa1 = ref MemoryMarshal.GetArrayDataReference(a1);
        ref var pa2 = ref MemoryMarshal.GetArrayDataReference(a2);
        ref var pa3 = ref MemoryMarshal.GetArrayDataReference(a3);
        ref var pb0 = ref MemoryMarshal.GetArrayDataReference(b0);
        ref var pb1 = ref MemoryMarshal.GetArrayDataReference(b1);
        ref var pb2 = ref MemoryMarshal.GetArrayDataReference(b2);
        ref var pb3 = ref MemoryMarshal.GetArrayDataReference(b3);
        ref var pe = ref MemoryMarshal.GetReference(edges);
        Vector256<double> ta = Vector256<double>.Zero, tb = Vector256<double>.Zero;
        for (var i = 1; i <= cells; i++)
        {
            ta += Vector256.Create(Unsafe.Add(ref pa0, i), Unsafe.Add(ref pa1, i), Unsafe.Add(ref pa2, i), Unsafe.Add(ref pa3, i));
            tb += Vector256.Create(Unsafe.Add(ref pb0, i), Unsafe.Add(ref pb1, i), Unsafe.Add(ref pb2, i), Unsafe.Add(ref pb3, i));
        }
        for (var k = 0; k < 4; k++)
            if (!(ta[k] > 0) || !(tb[k] > 0) || !double.IsFinite(ta[k]) || !double.IsFinite(tb[k]))
                return Alone(edges); // FineGrid says what is wrong
        var one = Vector256<double>.One;
        var two = Vector256.Create(2.0);
        var half = Vector256.Create(0.5);
        Vector256<double> ia = one / ta, ib = one / tb;
        var area = Vector256.Abs(Vector256.Create(pa0, pa1, pa2, pa3) * ia - Vector256.Create(pb0, pb1, pb2, pb3) * ib);
        var ca = Vector256.Create(Unsafe.Add(ref pa0, 1), Unsafe.Add(ref pa1, 1), Unsafe.Add(ref pa2, 1), Unsafe.Add(ref pa3, 1));
        var cb = Vector256.Create(Unsafe.Add(ref pb0, 1), Unsafe.Add(ref pb1, 1), Unsafe.Add(ref pb2, 1), Unsafe.Add(ref pb3, 1));
        var d0 = ca * ia - cb * ib;
        for (var i = 1; i < edges.Length; i++)
        {
            var j = i + 1;
            ca += Vector256.Create(Unsafe.Add(ref pa0, j), Unsafe.Add(ref pa1, j), Unsafe.Add(ref pa2, j), Unsafe.Add(ref pa3, j));
            cb += Vector256.Create(Unsafe.Add(ref pb0, j), Unsafe.Add(ref pb1, j), Unsafe.Add(ref pb2, j), Unsafe.Add(ref pb3, j));
            var d1 = ca * ia - cb * ib;
            var sum = Vector256.Abs(d0) + Vector256.Abs(d1);
            var sameSign = Vector256.GreaterThanOrEqual(d0 * d1, Vector256<double>.Zero);
            // sum · ½ is sum / 2 to the bit (halving is exact), without a division.
            var mean = Vector256.ConditionalSelect(sameSign, sum * half, (d0 * d0 + d1 * d1) / (two * sum));
            area += Vector256.Create(Unsafe.Add(ref pe, i) - Unsafe.Add(ref pe, i - 1)) * mean;
            d0 = d1;
        }
        var last = cells + 1;
        area += Vector256.Abs(Vector256.Create(Unsafe.Add(ref pa0, last), Unsafe.Add(ref pa1, last), Unsafe.Add(ref pa2, last), Unsafe.Add(ref pa3, last)) * ia
            - Vector256.Create(Unsafe.Add(ref pb0, last), Unsafe.Add(ref pb1, last), Unsafe.Add(ref pb2, last), Unsafe.Add(ref pb3, last)) * ib);
        return (area[0], area[1], area[2], area[3]);
    }
}
