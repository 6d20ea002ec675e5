using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// The unit-weight co-moments of several pairs of one batch, four pairs at a time, one pair to a SIMD lane: each lane
/// adds its own pair's rows in row order, with the operations of <see cref="CoMoments.AddBatch"/>'s unit-weight loop,
/// so every lane's sums are that loop's to the bit (IEEE arithmetic in a lane is the scalar arithmetic, and no sum is
/// split across lanes). Only the order of the pairs' work changes, not any pair's order of additions.
/// </summary>
internal static class PairMomentLanes
{
    /// <summary>Pairs a SIMD register holds.</summary>
    public const int Width = 4;

    /// <summary>Whether the lanes run here; where not, each pair is added on its own.</summary>
    public static bool Supported => Vector256.IsHardwareAccelerated;

    /// <summary>
    /// Adds to <paramref name="targets"/>[k] the pairs (x_k[r], y_k[r]) of unit weight, r below the columns' common
    /// length, for up to <see cref="Width"/> pairs; the columns of lanes beyond the targets' count are not read.
    /// </summary>
    public static void Add(ReadOnlySpan<WeightedCorrelation> targets, ReadOnlySpan<double> x0, ReadOnlySpan<double> y0,
        ReadOnlySpan<double> x1, ReadOnlySpan<double> y1, ReadOnlySpan<double> x2, ReadOnlySpan<double> y2,
        ReadOnlySpan<double> x3, ReadOnlySpan<double> y3)
    {
        var n = targets.Length;
        if (n is < 1 or > Width) throw new ArgumentOutOfRangeException(nameof(targets));
        // Lanes without a pair repeat the first pair; their sums are dropped.
        if (n < 2) { x1 = x0; y1 = y0; }
        if (n < 3) { x2 = x0; y2 = y0; }
        if (n < 4) { x3 = x0; y3 = y0; }
        var rows = x0.Length;
        if (y0.Length != rows || x1.Length != rows || y1.Length != rows || x2.Length != rows || y2.Length != rows || x3.Length != rows || y3.Length != rows)
            throw new ArgumentException("The pairs' columns differ in length.", nameof(x1));
        if (rows == 0)
        {
            foreach (var t in targets) t.AddUnitCentral(0, 0, 0, []);
            return;
        }
        ref double a0 = ref MemoryMarshal.GetReference(x0), a1 = ref MemoryMarshal.GetReference(x1),
            a2 = ref MemoryMarshal.GetReference(x2), a3 = ref MemoryMarshal.GetReference(x3),
            b0 = ref MemoryMarshal.GetReference(y0), b1 = ref MemoryMarshal.GetReference(y1),
            b2 = ref MemoryMarshal.GetReference(y2), b3 = ref MemoryMarshal.GetReference(y3);
        var (sx, sy) = Sums(rows, ref a0, ref a1, ref a2, ref a3, ref b0, ref b1, ref b2, ref b3);
        // The means as the scalar loop divides them: the sum over Σw, which is the row count (a sum of ones, exact).
        var count = Vector256.Create((double)rows);
        var mx = sx / count;
        var my = sy / count;
        Span<double> central = stackalloc double[12 * Width];
        Central(rows, ref a0, ref a1, ref a2, ref a3, ref b0, ref b1, ref b2, ref b3, mx, my, central);
        Span<double> one = stackalloc double[12];
        for (var k = 0; k < n; k++)
        {
            for (var j = 0; j < 12; j++) one[j] = central[j * Width + k];
            targets[k].AddUnitCentral(rows, mx.GetElement(k), my.GetElement(k), one);
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static (Vector256<double> X, Vector256<double> Y) Sums(int rows, ref double a0, ref double a1, ref double a2, ref double a3,
        ref double b0, ref double b1, ref double b2, ref double b3)
    {
        Vector256<double> sx = default, sy = default;
        for (nint i = 0; i < rows; i++)
        {
            sx += Vector256.Create(Unsafe.Add(ref a0, i), Unsafe.Add(ref a1, i), Unsafe.Add(ref a2, i), Unsafe.Add(ref a3, i));
            sy += Vector256.Create(Unsafe.Add(ref b0, i), Unsafe.Add(ref b1, i), Unsafe.Add(ref b2, i), Unsafe.Add(ref b3, i));
        }
        return (sx, sy);
    }

    // The twelve central sums, in the order M_20, M_11, M_02, M_30, M_21, M_12, M_03, M_40, M_31, M_22, M_13, M_04, each a
    // register of the four lanes, written to central[j * Width + lane].
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Central(int rows, ref double a0, ref double a1, ref double a2, ref double a3,
        ref double b0, ref double b1, ref double b2, ref double b3, Vector256<double> mx, Vector256<double> my, Span<double> central)
    {
        Vector256<double> m20 = default, m11 = default, m02 = default, m30 = default, m21 = default, m12 = default,
            m03 = default, m40 = default, m31 = default, m22 = default, m13 = default, m04 = default;
        for (nint i = 0; i < rows; i++)
        {
            var dx = Vector256.Create(Unsafe.Add(ref a0, i), Unsafe.Add(ref a1, i), Unsafe.Add(ref a2, i), Unsafe.Add(ref a3, i)) - mx;
            var dy = Vector256.Create(Unsafe.Add(ref b0, i), Unsafe.Add(ref b1, i), Unsafe.Add(ref b2, i), Unsafe.Add(ref b3, i)) - my;
            Vector256<double> dx2 = dx * dx, dy2 = dy * dy, dxy = dx * dy;
            m20 += dx2;
            m11 += dxy;
            m02 += dy2;
            m30 += dx2 * dx;
            m21 += dx2 * dy;
            m12 += dxy * dy;
            m03 += dy2 * dy;
            m40 += dx2 * dx2;
            m31 += dx2 * dxy;
            m22 += dx2 * dy2;
            m13 += dxy * dy2;
            m04 += dy2 * dy2;
        }
        var j = 0;
        foreach (var m in (ReadOnlySpan<Vector256<double>>)[m20, m11, m02, m30, m21, m12, m03, m40, m31, m22, m13, m04])
            m.CopyTo(central.Slice(Width * j++, Width));
    }
}
