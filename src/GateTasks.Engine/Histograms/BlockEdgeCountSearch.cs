using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace GateTasks.Engine.Histograms;

/// <summary>
/// The cells of float32 values on a long axis (thousands of edges, as a fine equal-probability grid has) by counting
/// edges in three levels, with no branch on where a value falls: first, for many values at once, the count of every
/// 256th edge at or below each value, which names the run of 256 edges holding its cell; then, per value, the count of
/// every 16th edge of that run at or below it, which names the block of 16; then the count of that block's edges at
/// or below it — each of the last two one SIMD compare of 16 floats (two with AVX2) and one population count. At each
/// level the edges before the chosen run are all at or below the value and those after it all above, so the total is
/// the count of all edges at or below the value: the storage cell a lower-bound search gives (0 below the first edge,
/// the edge count at or above the last), as <see cref="EdgeCountSearch"/> counts short axes. The float edges are
/// rounded up from the doubles (<see cref="EdgeCountSearch.Float32Edges"/>), so a float value gets the cell of the same
/// value as a double; the tables are padded with NaN, which no value reaches. A guide table's step
/// (<see cref="VariableAxis"/>) mispredicts where many narrow cells crowd one bucket, as they do near a fine grid's mode.
/// </summary>
internal sealed class BlockEdgeCountSearch
{
    /// <summary>Edges per block, and blocks per run: one AVX-512 register of floats.</summary>
    public const int Stride = 16;

    private const int Run = Stride * Stride;

    private readonly float[] _runFirsts;   // edge 256·r, the first of run r
    private readonly float[] _blockFirsts; // edge 16·b, the first of block b, padded with NaN to whole runs
    private readonly float[] _edges;       // every edge, padded with NaN to whole blocks of the padded block table
    private readonly float[]? _guideEdges; // the edges for the guide table, made on first use (null: none wanted)
    private EdgeGuide? _guide;             // the cells of most values, in one table read and one compare
    private volatile bool _guideMade;

    /// <summary>Whether this machine has SIMD registers for the search (else callers keep their scalar search).</summary>
    public static bool IsSupported => Vector512.IsHardwareAccelerated || Vector256.IsHardwareAccelerated;

    /// <summary>
    /// A search over increasing <paramref name="edges"/> (doubles; compared as float values compare); with
    /// <paramref name="guided"/> false, the three levels alone (for tests and benchmarks).
    /// </summary>
    public BlockEdgeCountSearch(ReadOnlySpan<double> edges, bool guided = true)
    {
        var rounded = EdgeCountSearch.Float32Edges(edges);
        var runs = (rounded.Length + Run - 1) / Run;
        _edges = new float[runs * Run];
        _edges.AsSpan().Fill(float.NaN);
        rounded.CopyTo(_edges, 0);
        _blockFirsts = new float[runs * Stride];
        for (var b = 0; b < _blockFirsts.Length; b++) _blockFirsts[b] = _edges[b * Stride];
        _runFirsts = new float[runs];
        for (var r = 0; r < runs; r++) _runFirsts[r] = _edges[r * Run];
        // The table (a quarter of a megabyte for a fine grid) is made when values first come, not for axes that are
        // only read (the reference's).
        if (guided && EdgeGuide.IsSupported) _guideEdges = rounded;
    }

    /// <summary>
    /// The storage cell of every value (the count of edges at or below it), or <paramref name="nanCell"/> for NaN.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Cells(ReadOnlySpan<float> values, Span<int> cells, int nanCell)
    {
        if (cells.Length < values.Length) throw new ArgumentException("Fewer cells than values.", nameof(cells));
        if (!_guideMade)
        {
            // Two threads may both make it: either table gives the same cells.
            _guide = _guideEdges is null ? null : EdgeGuide.Create(_guideEdges);
            _guideMade = true;
        }
        if (_guide is not { } guide)
        {
            Levels(values, cells, nanCell);
            return;
        }
        // Most values take the guide table's two compares; those in crowded buckets are gathered and counted here.
        Span<int> crowded = stackalloc int[EdgeGuide.Chunk];
        Span<float> held = stackalloc float[EdgeGuide.Chunk];
        Span<int> heldCells = stackalloc int[EdgeGuide.Chunk];
        for (var start = 0; start < values.Length; start += EdgeGuide.Chunk)
        {
            var chunk = values.Slice(start, Math.Min(EdgeGuide.Chunk, values.Length - start));
            var chunkCells = cells.Slice(start, chunk.Length);
            var k = guide.Cells(chunk, chunkCells, nanCell, crowded);
            if (k == 0) continue;
            for (var j = 0; j < k; j++) held[j] = chunk[crowded[j]];
            Levels(held[..k], heldCells, nanCell);
            for (var j = 0; j < k; j++) chunkCells[crowded[j]] = heldCells[j];
        }
    }

    // The three-level count of every value.
    private void Levels(ReadOnlySpan<float> values, Span<int> cells, int nanCell)
    {
        var done = RunCounts(values, cells);
        for (var i = done; i < values.Length; i++)
        {
            var runs = 0;
            foreach (var p in _runFirsts) runs += values[i] >= p ? 1 : 0;
            cells[i] = runs;
        }
        ref var f0 = ref MemoryMarshal.GetArrayDataReference(_blockFirsts);
        ref var e0 = ref MemoryMarshal.GetArrayDataReference(_edges);
        for (var i = 0; i < values.Length; i++)
        {
            var v = values[i];
            // Below a level's first edge the value is below every edge, and run or block 0 counts none of them: no
            // branch needed.
            var run = Math.Max(cells[i] - 1, 0);
            var block = run * Stride + Math.Max(AtOrBelow(v, ref Unsafe.Add(ref f0, run * Stride)) - 1, 0);
            var cell = block * Stride + AtOrBelow(v, ref Unsafe.Add(ref e0, block * Stride));
            cells[i] = float.IsNaN(v) ? nanCell : cell;
        }
    }

    /// <summary>How many of 16 floats from <paramref name="at"/> are at or below <paramref name="v"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static int AtOrBelow(float v, ref float at)
    {
        if (Vector512.IsHardwareAccelerated)
            return BitOperations.PopCount(Vector512.GreaterThanOrEqual(Vector512.Create(v), Vector512.LoadUnsafe(ref at)).ExtractMostSignificantBits());
        var x = Vector256.Create(v);
        var low = Vector256.GreaterThanOrEqual(x, Vector256.LoadUnsafe(ref at)).ExtractMostSignificantBits();
        var high = Vector256.GreaterThanOrEqual(x, Vector256.LoadUnsafe(ref at, 8)).ExtractMostSignificantBits();
        return BitOperations.PopCount(low | (high << 8));
    }

    /// <summary>
    /// For the leading values (a whole number of pairs of SIMD registers), the count of run firsts at or below each,
    /// into <paramref name="counts"/>; returns how many were done.
    /// </summary>
    private int RunCounts(ReadOnlySpan<float> values, Span<int> counts)
    {
        ref var v0 = ref MemoryMarshal.GetReference(values);
        ref var c0 = ref MemoryMarshal.GetReference(counts);
        ref var p0 = ref MemoryMarshal.GetArrayDataReference(_runFirsts);
        var n = _runFirsts.Length;
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
}
