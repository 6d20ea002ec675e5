using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace GateTasks.Engine.Histograms;

/// <summary>
/// Finds the cells of many values at once by counting, for each value, the edges at or below it: with edges
/// e₀ &lt; … &lt; e_n, that count is 0 below e₀ (the underflow cell), k inside [e_{k−1}, e_k) (cell k, bin k − 1) and
/// n + 1 at or above e_n (the overflow cell), exactly the storage cell a lower-bound search gives. One SIMD compare
/// per edge over a register of values, no branch and no table, so the cost does not depend on how the values fall
/// (a guide table slows down where many narrow bins share a bucket, as in long tails). Worth it for a few dozen
/// edges, what default equal-probability binning uses; longer axes keep their own search. NaN meets no edge and is
/// given the NaN cell.
/// </summary>
internal static class EdgeCountSearch
{
    /// <summary>The most edges counted this way; an axis with more searches instead.</summary>
    public const int MaxEdges = 64;

    /// <summary>Whether this machine has SIMD registers for the search (else callers keep their scalar search).</summary>
    public static bool IsSupported => Vector512.IsHardwareAccelerated || Vector256.IsHardwareAccelerated;

    /// <summary>
    /// The cells of the leading values of <paramref name="values"/> (a whole number of SIMD registers of them) into
    /// <paramref name="cells"/>; returns how many were done, the rest being the caller's.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static int Cells(ReadOnlySpan<double> values, ReadOnlySpan<double> edges, Span<int> cells, int nanCell)
    {
        if (cells.Length < values.Length) throw new ArgumentException("Fewer cells than values.", nameof(cells));
        ref var v0 = ref MemoryMarshal.GetReference(values);
        ref var c0 = ref MemoryMarshal.GetReference(cells);
        ref var e0 = ref MemoryMarshal.GetReference(edges);
        var n = edges.Length;
        var i = 0;
        if (Vector512.IsHardwareAccelerated)
        {
            var nan = Vector512.Create((long)nanCell);
            for (; i + 16 <= values.Length; i += 16)
            {
                var a = Vector512.LoadUnsafe(ref v0, (nuint)i);
                var b = Vector512.LoadUnsafe(ref v0, (nuint)(i + 8));
                Vector512<long> ca = default, cb = default;
                for (var k = 0; k < n; k++)
                {
                    var e = Vector512.Create(Unsafe.Add(ref e0, k));
                    ca -= Vector512.GreaterThanOrEqual(a, e).AsInt64(); // all ones (−1) where the edge is at or below
                    cb -= Vector512.GreaterThanOrEqual(b, e).AsInt64();
                }
                ca = Vector512.ConditionalSelect(Vector512.Equals(a, a).AsInt64(), ca, nan);
                cb = Vector512.ConditionalSelect(Vector512.Equals(b, b).AsInt64(), cb, nan);
                Vector512.Narrow(ca, cb).StoreUnsafe(ref c0, (nuint)i);
            }
            return i;
        }
        if (Vector256.IsHardwareAccelerated)
        {
            var nan = Vector256.Create((long)nanCell);
            for (; i + 8 <= values.Length; i += 8)
            {
                var a = Vector256.LoadUnsafe(ref v0, (nuint)i);
                var b = Vector256.LoadUnsafe(ref v0, (nuint)(i + 4));
                Vector256<long> ca = default, cb = default;
                for (var k = 0; k < n; k++)
                {
                    var e = Vector256.Create(Unsafe.Add(ref e0, k));
                    ca -= Vector256.GreaterThanOrEqual(a, e).AsInt64();
                    cb -= Vector256.GreaterThanOrEqual(b, e).AsInt64();
                }
                ca = Vector256.ConditionalSelect(Vector256.Equals(a, a).AsInt64(), ca, nan);
                cb = Vector256.ConditionalSelect(Vector256.Equals(b, b).AsInt64(), cb, nan);
                Vector256.Narrow(ca, cb).StoreUnsafe(ref c0, (nuint)i);
            }
        }
        return i;
    }
    /// <summary>
    /// The float32 edges that count float values as <paramref name="edges"/> counts them as doubles: for a float x,
    /// x ≥ e exactly when x ≥ the smallest float not below e, so each edge is rounded up to a float (beyond the float
    /// range, to ±∞ or the largest finite float, where the same holds).
    /// </summary>
    public static float[] Float32Edges(ReadOnlySpan<double> edges)
    {
        var result = new float[edges.Length];
        for (var k = 0; k < edges.Length; k++)
        {
            var f = (float)edges[k];
            result[k] = f < edges[k] ? MathF.BitIncrement(f) : f;
        }
        return result;
    }

    /// <summary>
    /// <see cref="Cells(ReadOnlySpan{double}, ReadOnlySpan{double}, Span{int}, int)"/> for values stored as float32,
    /// against <see cref="Float32Edges"/>: the same cells, twice the values per register.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static int Cells(ReadOnlySpan<float> values, ReadOnlySpan<float> edges, Span<int> cells, int nanCell)
    {
        if (cells.Length < values.Length) throw new ArgumentException("Fewer cells than values.", nameof(cells));
        ref var v0 = ref MemoryMarshal.GetReference(values);
        ref var c0 = ref MemoryMarshal.GetReference(cells);
        ref var e0 = ref MemoryMarshal.GetReference(edges);
        var n = edges.Length;
        var i = 0;
        if (Vector512.IsHardwareAccelerated)
        {
            var nan = Vector512.Create(nanCell);
            for (; i + 32 <= values.Length; i += 32)
            {
                var a = Vector512.LoadUnsafe(ref v0, (nuint)i);
                var b = Vector512.LoadUnsafe(ref v0, (nuint)(i + 16));
                Vector512<int> ca = default, cb = default;
                for (var k = 0; k < n; k++)
                {
                    var e = Vector512.Create(Unsafe.Add(ref e0, k));
                    ca -= Vector512.GreaterThanOrEqual(a, e).AsInt32();
                    cb -= Vector512.GreaterThanOrEqual(b, e).AsInt32();
                }
                Vector512.ConditionalSelect(Vector512.Equals(a, a).AsInt32(), ca, nan).StoreUnsafe(ref c0, (nuint)i);
                Vector512.ConditionalSelect(Vector512.Equals(b, b).AsInt32(), cb, nan).StoreUnsafe(ref c0, (nuint)(i + 16));
            }
            return i;
        }
        if (Vector256.IsHardwareAccelerated)
        {
            var nan = Vector256.Create(nanCell);
            for (; i + 16 <= values.Length; i += 16)
            {
                var a = Vector256.LoadUnsafe(ref v0, (nuint)i);
                var b = Vector256.LoadUnsafe(ref v0, (nuint)(i + 8));
                Vector256<int> ca = default, cb = default;
                for (var k = 0; k < n; k++)
                {
                    var e = Vector256.Create(Unsafe.Add(ref e0, k));
                    ca -= Vector256.GreaterThanOrEqual(a, e).AsInt32();
                    cb -= Vector256.GreaterThanOrEqual(b, e).AsInt32();
                }
                Vector256.ConditionalSelect(Vector256.Equals(a, a).AsInt32(), ca, nan).StoreUnsafe(ref c0, (nuint)i);
                Vector256.ConditionalSelect(Vector256.Equals(b, b).AsInt32(), cb, nan).StoreUnsafe(ref c0, (nuint)(i + 8));
            }
        }
        return i;
    }
}
