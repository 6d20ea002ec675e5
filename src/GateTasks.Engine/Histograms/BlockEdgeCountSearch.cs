using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace GateTasks.Engine.Histograms;

/// <summary>
/// The cells of float32 values on a long axis (thousands of edges, as a fine equal-probability grid has) by counting
/// edges in two levels, with no branch on where a value falls: first, for many values at once, the count of every
/// 64th edge (the pivots) at or below each value, which names the block of 64 edges holding its cell; then, per value,
/// the count of that block's edges at or below it, from four (AVX-512) or eight (AVX2) SIMD compares and one
/// population count. Edges before the block are all at or below the value and edges after it all above, so the
/// total is the count of all edges at or below the value: the storage cell a lower-bound search gives (0 below the
/// first edge, the edge count at or above the last), as <see cref="EdgeCountSearch"/> counts short axes. The float
/// edges are rounded up from the doubles (<see cref="EdgeCountSearch.Float32Edges"/>), so a float value gets the cell
/// of the same value as a double; the last block is padded with NaN, which no value reaches. A guide table's step
/// (<see cref="VariableAxis"/>) mispredicts where many narrow cells crowd one bucket, as they do near a fine grid's mode.
/// </summary>
internal sealed class BlockEdgeCountSearch
{
    /// <summary>Edges per block: four AVX-512 registers of floats.</summary>
    public const int BlockEdges = 64;

    private readonly float[] _pivots; // edge 64·j, the first of block j
    private readonly float[] _blocks; // every edge, padded with NaN to whole blocks
    private readonly int _edgeCount;

    /// <summary>Whether this machine has SIMD registers for the search (else callers keep their scalar search).</summary>
    public static bool IsSupported => Vector512.IsHardwareAccelerated || Vector256.IsHardwareAccelerated;

    /// <summary>A search over increasing <paramref name="edges"/> (doubles; compared as float values compare).</summary>
    public BlockEdgeCountSearch(ReadOnlySpan<double> edges)
    {
        var rounded = EdgeCountSearch.Float32Edges(edges);
        _edgeCount = rounded.Length;
        var blocks = (rounded.Length + BlockEdges - 1) / BlockEdges;
        _blocks = new float[blocks * BlockEdges];
        _blocks.AsSpan().Fill(float.NaN);
        rounded.CopyTo(_blocks, 0);
        _pivots = new float[blocks];
        for (var j = 0; j < blocks; j++) _pivots[j] = rounded[j * BlockEdges];
    }

    /// <summary>
    /// The storage cell of every value (the count of edges at or below it), or <paramref name="nanCell"/> for NaN.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Cells(ReadOnlySpan<float> values, Span<int> cells, int nanCell)
    {
        if (cells.Length < values.Length) throw new ArgumentException("Fewer cells than values.", nameof(cells));
        var done = PivotCounts(values, cells);
        for (var i = done; i < values.Length; i++)
        {
            var pivots = 0;
            foreach (var p in _pivots) pivots += values[i] >= p ? 1 : 0;
            cells[i] = pivots;
        }
        ref var b0 = ref MemoryMarshal.GetArrayDataReference(_blocks);
        for (var i = 0; i < values.Length; i++)
        {
            var v = values[i];
            // Below the first pivot the value is below every edge, and block 0 counts none of them: no branch needed.
            var block = Math.Max(cells[i] - 1, 0);
            var cell = block * BlockEdges + InBlock(v, ref Unsafe.Add(ref b0, block * BlockEdges));
            cells[i] = float.IsNaN(v) ? nanCell : cell;
        }
    }

    /// <summary>The edges of one block (64 floats from <paramref name="block"/>) at or below <paramref name="v"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static int InBlock(float v, ref float block)
    {
        if (Vector512.IsHardwareAccelerated)
        {
            var x = Vector512.Create(v);
            var m0 = Vector512.GreaterThanOrEqual(x, Vector512.LoadUnsafe(ref block)).ExtractMostSignificantBits();
            var m1 = Vector512.GreaterThanOrEqual(x, Vector512.LoadUnsafe(ref block, 16)).ExtractMostSignificantBits();
            var m2 = Vector512.GreaterThanOrEqual(x, Vector512.LoadUnsafe(ref block, 32)).ExtractMostSignificantBits();
            var m3 = Vector512.GreaterThanOrEqual(x, Vector512.LoadUnsafe(ref block, 48)).ExtractMostSignificantBits();
            return BitOperations.PopCount(m0 | (m1 << 16) | (m2 << 32) | (m3 << 48));
        }
        var y = Vector256.Create(v);
        ulong mask = 0;
        for (var k = 0; k < BlockEdges / 8; k++)
            mask |= (ulong)Vector256.GreaterThanOrEqual(y, Vector256.LoadUnsafe(ref block, (nuint)(8 * k))).ExtractMostSignificantBits() << (8 * k);
        return BitOperations.PopCount(mask);
    }

    /// <summary>
    /// For the leading values (a whole number of pairs of SIMD registers), the count of pivots at or below each, into
    /// <paramref name="counts"/>; returns how many were done.
    /// </summary>
    private int PivotCounts(ReadOnlySpan<float> values, Span<int> counts)
    {
        ref var v0 = ref MemoryMarshal.GetReference(values);
        ref var c0 = ref MemoryMarshal.GetReference(counts);
        ref var p0 = ref MemoryMarshal.GetArrayDataReference(_pivots);
        var n = _pivots.Length;
        var i = 0;
        if (Vector512.IsHardwareAccelerated)
        {
            for (; i + 32 <= values.Length; i += 32)
            {
                var a = Vector512.LoadUnsafe(ref v0, (nuint)i);
                var b = Vector512.LoadUnsafe(ref v0, (nuint)(i + 16));
                Vector512<int> ca = default, cb = default;
                for (var k = 0; k < n; k++)
                {
                    var e = Vector512.Create(Unsafe.Add(ref p0, k));
                    ca -= Vector512.GreaterThanOrEqual(a, e).AsInt32();
                    cb -= Vector512.GreaterThanOrEqual(b, e).AsInt32();
                }
                ca.StoreUnsafe(ref c0, (nuint)i);
                cb.StoreUnsafe(ref c0, (nuint)(i + 16));
            }
            return i;
        }
        if (Vector256.IsHardwareAccelerated)
        {
            for (; i + 16 <= values.Length; i += 16)
            {
                var a = Vector256.LoadUnsafe(ref v0, (nuint)i);
                var b = Vector256.LoadUnsafe(ref v0, (nuint)(i + 8));
                Vector256<int> ca = default, cb = default;
                for (var k = 0; k < n; k++)
                {
                    var e = Vector256.Create(Unsafe.Add(ref p0, k));
                    ca -= Vector256.GreaterThanOrEqual(a, e).AsInt32();
                    cb -= Vector256.GreaterThanOrEqual(b, e).AsInt32();
                }
                ca.StoreUnsafe(ref c0, (nuint)i);
                cb.StoreUnsafe(ref c0, (nuint)(i + 8));
            }
        }
        return i;
    }

    /// <summary>The number of edges (the overflow cell).</summary>
    public int EdgeCount => _edgeCount;
}
