using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace GateTasks.Engine.Histograms;

/// <summary>
/// A guide table over a long axis's float edges (the guide-table search; Chen and Asau, 1974): buckets between two
/// edges, each holding how many edges lie in the buckets before it and, where it holds one edge, that edge. A value's
/// bucket comes from a monotone map (<see cref="Mapping"/>): it never decreases as the value grows, so every edge in
/// an earlier bucket is below the value and every edge in a later one above it, and the count of edges at or below the
/// value is the bucket's entry plus one where the value is at or above the bucket's own edge — one table read and one
/// compare, with no branch. Buckets holding more than one edge (a dense mode, a spike, repeated or very close edges)
/// are marked, and their values are left to the caller's search. Edges are put in buckets by the same operations as
/// values, so rounding cannot put an edge on the wrong side of a value; of a few maps, the one that leaves the fewest
/// edges in crowded buckets is kept (on an equal-probability grid, about the share of values the caller then searches).
/// </summary>
internal sealed class EdgeGuide
{
    /// <summary>Edges a bucket may hold and still answer alone (one compare); a bucket holding more is crowded.</summary>
    private const int Steps = 1;

    /// <summary>Values whose cells are found in one call (a caller's scratch spans hold this many).</summary>
    public const int Chunk = 256;

    private const int Crowded = -1;

    private readonly Mapping _map;
    // Per bucket, one gather's worth: the count of edges in earlier buckets, or Crowded (low 32 bits), and the bits of
    // its one edge, or of NaN (which no value reaches) where it has none (high 32 bits).
    private readonly long[] _entries;

    /// <summary>
    /// How values map to buckets, two monotone ways: affine in the value (float operations), or affine in the float's
    /// bits read as an ordered integer (−0 taken as +0), which is piecewise affine and logarithmic across powers of two,
    /// so a long tail does not squeeze the mode into a few buckets. Values outside [lo, hi] go to the end buckets.
    /// </summary>
    private readonly record struct Mapping(bool Bits, float Lo, float Scale, float LastBucket, int KeyLo, int KeyHi, int Shift)
    {
        public int Bucket(float v)
        {
            if (Bits)
            {
                var key = Math.Clamp(Key(BitConverter.SingleToInt32Bits(v)), KeyLo, KeyHi);
                return (int)((uint)(key - KeyLo) >> Shift);
            }
            var t = (v - Lo) * Scale;
            t = t > 0 ? t : 0;
            return (int)(t < LastBucket ? t : LastBucket);
        }

        // The bits of a float as an integer that orders as the floats do: sign and magnitude to two's complement.
        public static int Key(int bits)
        {
            var sign = bits >> 31;
            return ((bits & int.MaxValue) ^ sign) - sign;
        }
    }

    private EdgeGuide(Mapping map, int buckets, ReadOnlySpan<float> edges)
    {
        _map = map;
        // Buckets never decrease along the edges: each bucket's edges are the next run of them.
        _entries = new long[buckets];
        var nan = (long)BitConverter.SingleToInt32Bits(float.NaN) << 32;
        for (int k = 0, j = 0; k < buckets; k++)
        {
            var start = j;
            while (j < edges.Length && map.Bucket(edges[j]) == k) j++;
            _entries[k] = j - start > Steps ? unchecked((uint)Crowded) | nan
                : j - start == 1 ? (uint)start | ((long)BitConverter.SingleToInt32Bits(edges[start]) << 32)
                : (uint)start | nan;
        }
    }

    /// <summary>
    /// A guide over increasing float <paramref name="edges"/> (repeats allowed), with about four buckets per edge
    /// (2^13 to 2^15); of the two mappings and a few spans (all finite edges, or a few of the outermost left to the end
    /// buckets), the one that leaves the fewest edges in crowded buckets. Null where no mapping leaves most edges in
    /// uncrowded buckets. On a grid of equal-probability edges, the share of edges in crowded buckets is about the
    /// share of values that take the caller's search.
    /// </summary>
    public static EdgeGuide? Create(ReadOnlySpan<float> edges)
    {
        int first = 0, last = edges.Length - 1;
        while (first < edges.Length && !float.IsFinite(edges[first])) first++;
        while (last >= 0 && !float.IsFinite(edges[last])) last--;
        if (first >= last) return null;
        var buckets = (int)Math.Clamp(BitOperations.RoundUpToPowerOf2((uint)edges.Length * 4), 1u << 13, 1u << 15);
        (Mapping Map, int Crowded)? best = null;
        foreach (var trim in new[] { 0, 4, 16, 64 })
        {
            if (last - first - 2 * trim < 1) break;
            float lo = edges[first + trim], hi = edges[last - trim];
            if (!(hi > lo)) continue;
            var scale = (float)(buckets / ((double)hi - lo));
            if (float.IsFinite(scale) && scale > 0)
                Consider(new Mapping(false, lo, scale, buckets - 1, 0, 0, 0), edges, ref best);
            int keyLo = Mapping.Key(BitConverter.SingleToInt32Bits(lo)), keyHi = Mapping.Key(BitConverter.SingleToInt32Bits(hi));
            var shift = 0;
            while (((long)keyHi - keyLo) >> shift >= buckets) shift++;
            Consider(new Mapping(true, 0, 0, 0, keyLo, keyHi, shift), edges, ref best);
        }
        return best is { } b && b.Crowded <= edges.Length / 2 ? new EdgeGuide(b.Map, buckets, edges) : null;

        // The edges in crowded buckets: buckets never decrease along the edges, so each bucket's edges are one run.
        static void Consider(Mapping map, ReadOnlySpan<float> edges, ref (Mapping Map, int Crowded)? best)
        {
            var crowded = 0;
            for (var k = 0; k < edges.Length;)
            {
                var bucket = map.Bucket(edges[k]);
                var run = 1;
                while (k + run < edges.Length && map.Bucket(edges[k + run]) == bucket) run++;
                if (run > Steps) crowded += run;
                k += run;
            }
            if (best is null || crowded < best.Value.Crowded) best = (map, crowded);
        }
    }

    /// <summary>Whether values map to buckets by their float bits (else affine in the value).</summary>
    public bool MapsBits => _map.Bits;

    /// <summary>Whether this machine has the gathers the search needs (else callers keep their own search).</summary>
    public static bool IsSupported => Avx2.IsSupported;

    /// <summary>
    /// The storage cell (count of edges at or below) of each of up to <see cref="Chunk"/> values, or
    /// <paramref name="nanCell"/> for NaN; the indices of values in crowded buckets, whose cells are left unset, go to
    /// <paramref name="crowded"/>, and their number is returned.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public unsafe int Cells(ReadOnlySpan<float> values, Span<int> cells, int nanCell, Span<int> crowded)
    {
        var n = values.Length;
        if (n > Chunk || cells.Length < n || crowded.Length < n) throw new ArgumentException("A chunk too long for its scratch.");
        var map = _map;
        var count = 0;
        var i = 0;
        fixed (float* v0 = values)
        fixed (int* c0 = cells)
        fixed (long* p0 = _entries)
        {
            if (Avx2.IsSupported)
            {
                // Eight values at a time: bucket, then each bucket's entry (first cell and edge) in two gathers of four,
                // no branch but the rare crowded one. (On AMD EPYC a scalar loop of independent loads took about twice
                // as long per value, and separate gathers of the firsts and the edges about a tenth longer.)
                var nan = Vector256.Create(nanCell);
                var (keyLo, keyHi, magnitude) = (Vector256.Create(map.KeyLo), Vector256.Create(map.KeyHi), Vector256.Create(int.MaxValue));
                var (lo, scale, last) = (Vector256.Create(map.Lo), Vector256.Create(map.Scale), Vector256.Create(map.LastBucket));
                for (; i + 8 <= n; i += 8)
                {
                    var v = Vector256.Load(v0 + i);
                    Vector256<int> bucket;
                    if (map.Bits)
                    {
                        var bits = v.AsInt32();
                        var sign = Vector256.ShiftRightArithmetic(bits, 31);
                        var key = Vector256.Min(Vector256.Max(((bits & magnitude) ^ sign) - sign, keyLo), keyHi);
                        bucket = Vector256.ShiftRightLogical((key - keyLo).AsUInt32(), map.Shift).AsInt32();
                    }
                    else
                    {
                        var t = (v - lo) * scale;
                        t = Vector256.ConditionalSelect(Vector256.GreaterThan(t, Vector256<float>.Zero), t, Vector256<float>.Zero);
                        t = Vector256.ConditionalSelect(Vector256.LessThan(t, last), t, last);
                        bucket = Vector256.ConvertToInt32(t);
                    }
                    // Values 0, 1, 4, 5 gathered into one register and 2, 3, 6, 7 into the other, so that picking the
                    // even and the odd halves of each 128-bit lane puts the firsts and the edges back in value order.
                    var order = Avx2.PermuteVar8x32(bucket, Vector256.Create(0, 1, 4, 5, 2, 3, 6, 7));
                    var a = Avx2.GatherVector256(p0, order.GetLower(), 8).AsSingle();
                    var b = Avx2.GatherVector256(p0, order.GetUpper(), 8).AsSingle();
                    var entry = Avx.Shuffle(a, b, 0b10_00_10_00).AsInt32();
                    var c = entry - Vector256.GreaterThanOrEqual(v, Avx.Shuffle(a, b, 0b11_01_11_01)).AsInt32();
                    Vector256.ConditionalSelect(Vector256.Equals(v, v).AsInt32(), c, nan).Store(c0 + i);
                    for (var m = entry.ExtractMostSignificantBits(); m != 0; m &= m - 1)
                        crowded[count++] = i + BitOperations.TrailingZeroCount(m);
                }
            }
            for (; i < n; i++)
            {
                var v = v0[i];
                var entry = p0[map.Bucket(v)];
                var g = (int)entry;
                if (g < 0)
                {
                    crowded[count++] = i;
                    continue;
                }
                var c = g + (v >= BitConverter.Int32BitsToSingle((int)(entry >> 32)) ? 1 : 0);
                c0[i] = float.IsNaN(v) ? nanCell : c;
            }
        }
        return count;
    }

}
