using System.Numerics;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Per-block weighted sums Σw, Σw·x and Σw·x xᵀ (lower triangle) of rows laid out block-interleaved: position B·t + b
/// holds the t-th row of block b, so that one SIMD vector of consecutive positions holds rows of consecutive blocks
/// and every lane adds to its own block's sums. The B sets of sums then cost what one set costs, with no gather and no
/// sorting of rows by block; a block's sums are added in the order of its rows whatever the vector width, so the
/// result does not depend on the machine (separate multiply and add, never fused). Padding positions carry weight 0
/// and values 0 and add nothing. The caller centres the values (sums about a shift near the mean lose no precision:
/// Chan, Golub &amp; LeVeque 1983, Am. Stat. 37:242) and folds the sums into central moments once per batch.
/// </summary>
internal sealed class BlockInterleavedSums
{
    private readonly double[] _s0;     // [b]
    private readonly double[] _s1;     // [k·B + b]
    private readonly double[] _s2;     // [(p(p+1)/2 + q)·B + b], q ≤ p
    private readonly double[] _w2;     // [b]
    private readonly long[] _count;    // [b]
    private double[][] _weighted = [];  // scratch: w·x_k at each position

    /// <summary>Empty sums for <paramref name="dimension"/> features in <paramref name="blocks"/> blocks.</summary>
    public BlockInterleavedSums(int dimension, int blocks)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(dimension, 1);
        ArgumentOutOfRangeException.ThrowIfLessThan(blocks, 1);
        Dimension = dimension;
        Blocks = blocks;
        _s0 = new double[blocks];
        _s1 = new double[dimension * blocks];
        _s2 = new double[dimension * (dimension + 1) / 2 * blocks];
        _w2 = new double[blocks];
        _count = new long[blocks];
    }

    /// <summary>Features d.</summary>
    public int Dimension { get; }

    /// <summary>Blocks B.</summary>
    public int Blocks { get; }

    /// <summary>Rows with a non-zero weight added to block <paramref name="b"/>.</summary>
    public long Count(int b) => _count[b];

    /// <summary>Σw of block <paramref name="b"/>.</summary>
    public double SumOfWeights(int b) => _s0[b];

    /// <summary>Σw² of block <paramref name="b"/>.</summary>
    public double SumOfSquaredWeights(int b) => _w2[b];

    /// <summary>Σw·x_k of block <paramref name="b"/>.</summary>
    public double Sum(int k, int b) => _s1[k * Blocks + b];

    /// <summary>Σw·x_p·x_q of block <paramref name="b"/>.</summary>
    public double CrossSum(int p, int q, int b) => p >= q ? _s2[(p * (p + 1) / 2 + q) * Blocks + b] : _s2[(q * (q + 1) / 2 + p) * Blocks + b];

    /// <summary>Sets every sum to zero.</summary>
    public void Clear()
    {
        Array.Clear(_s0);
        Array.Clear(_s1);
        Array.Clear(_s2);
        Array.Clear(_w2);
        Array.Clear(_count);
    }

    /// <summary>
    /// Adds the first <paramref name="rowsPerBlock"/>·B positions of <paramref name="columns"/> (one array per feature)
    /// with their <paramref name="weights"/> (non-negative; 0 at padding, and for rows of the other sign when signs are
    /// kept apart).
    /// </summary>
    public void Add(double[][] columns, double[] weights, int rowsPerBlock) => Add(columns, weights, rowsPerBlock, unitWeights: false);

    /// <summary>
    /// As <see cref="Add(double[][], double[], int)"/>; with <paramref name="unitWeights"/> the caller promises that
    /// every weight is 1 except at padding, where it is 0 with values 0 (so w·x is x itself and is not formed).
    /// </summary>
    public void Add(double[][] columns, double[] weights, int rowsPerBlock, bool unitWeights)
    {
        var d = Dimension;
        var blocks = Blocks;
        var positions = rowsPerBlock * blocks;
        if (columns.Length != d) throw new ArgumentException($"{columns.Length} columns for {d} features.", nameof(columns));
        if (weights.Length < positions) throw new ArgumentException($"{weights.Length} weights for {positions} positions.", nameof(weights));
        if (positions == 0) return;
        if (_weighted.Length != d || _weighted[0].Length < positions)
            _weighted = Enumerable.Range(0, d).Select(_ => new double[positions]).ToArray();

        for (int t = 0, i = 0; t < rowsPerBlock; t++)
            for (var b = 0; b < blocks; b++, i++)
            {
                var w = weights[i];
                if (w == 0) continue;
                _count[b]++;
                _w2[b] += w * w;
            }
        var weighted = columns;
        if (!unitWeights)
        {
            for (var k = 0; k < d; k++) Multiply(weights.AsSpan(0, positions), columns[k].AsSpan(0, positions), _weighted[k].AsSpan(0, positions));
            weighted = _weighted;
        }
        if (Vector512.IsHardwareAccelerated && blocks % Vector512<double>.Count == 0)
        {
            LaneSums(weights, _s0, rowsPerBlock);
            for (var k = 0; k < d; k++) LaneSums(weighted[k], _s1.AsSpan(k * blocks, blocks), rowsPerBlock);
            for (var p = 0; p < d; p++)
            {
                var row = _s2.AsSpan(p * (p + 1) / 2 * blocks, (p + 1) * blocks);
                var q = 0;
                for (; q + 4 <= p + 1; q += 4)
                    CrossSums4(weighted[p], columns[q], columns[q + 1], columns[q + 2], columns[q + 3], row.Slice(q * blocks, 4 * blocks), rowsPerBlock);
                for (; q <= p; q++) LaneCrossSums(weighted[p], columns[q], row.Slice(q * blocks, blocks), rowsPerBlock);
            }
            return;
        }
        var width = Vector.IsHardwareAccelerated && blocks % Vector<double>.Count == 0 ? Vector<double>.Count : 1;
        if (width > 1)
        {
            LaneSums(weights, _s0, rowsPerBlock);
            for (var k = 0; k < d; k++) LaneSums(weighted[k], _s1.AsSpan(k * blocks, blocks), rowsPerBlock);
            for (var p = 0; p < d; p++)
            {
                var ap = weighted[p];
                var row = _s2.AsSpan(p * (p + 1) / 2 * blocks, (p + 1) * blocks);
                var q = 0;
                for (; q + 2 <= p + 1; q += 2)
                    LaneCrossSums2(ap, columns[q], columns[q + 1], row.Slice(q * blocks, 2 * blocks), rowsPerBlock);
                for (; q <= p; q++) LaneCrossSums(ap, columns[q], row.Slice(q * blocks, blocks), rowsPerBlock);
            }
        }
        else
        {
            for (var i = 0; i < positions; i++)
            {
                var b = i % blocks;
                _s0[b] += weights[i];
                for (var p = 0; p < d; p++)
                {
                    var ap = weighted[p][i];
                    _s1[p * blocks + b] += ap;
                    var at = p * (p + 1) / 2 * blocks + b;
                    for (var q = 0; q <= p; q++) _s2[at + q * blocks] += ap * columns[q][i];
                }
            }
        }
    }

    private static void Multiply(ReadOnlySpan<double> a, ReadOnlySpan<double> b, Span<double> product)
    {
        var i = 0;
        if (Vector.IsHardwareAccelerated)
            for (; i <= a.Length - Vector<double>.Count; i += Vector<double>.Count)
                (new Vector<double>(a[i..]) * new Vector<double>(b[i..])).CopyTo(product[i..]);
        for (; i < a.Length; i++) product[i] = a[i] * b[i];
    }

    // sums[b] += Σ_t x[B·t + b], one vector of lanes (blocks) at a time.
    private void LaneSums(double[] x, Span<double> sums, int rows)
    {
        var w = Vector<double>.Count;
        var blocks = Blocks;
        var xs = x.AsSpan();
        for (var lane = 0; lane < blocks; lane += w)
        {
            var acc = new Vector<double>(sums.Slice(lane, w));
            for (var t = 0; t < rows; t++) acc += new Vector<double>(xs.Slice(t * blocks + lane, w));
            acc.CopyTo(sums.Slice(lane, w));
        }
    }

    // sums[b] += Σ_t a[B·t + b]·y[B·t + b].
    private void LaneCrossSums(double[] a, double[] y, Span<double> sums, int rows)
    {
        var w = Vector<double>.Count;
        var blocks = Blocks;
        var av = MemoryMarshal.Cast<double, Vector<double>>(a.AsSpan(0, rows * blocks));
        var yv = MemoryMarshal.Cast<double, Vector<double>>(y.AsSpan(0, rows * blocks));
        var perRow = blocks / w;
        for (var lane = 0; lane < perRow; lane++)
        {
            var acc = new Vector<double>(sums.Slice(lane * w, w));
            for (int t = 0, i = lane; t < rows; t++, i += perRow) acc += av[i] * yv[i];
            acc.CopyTo(sums.Slice(lane * w, w));
        }
    }

    // Four columns at once in 8-lane vectors (sums[j·B .. (j+1)·B) for the j-th): a's vector is loaded once for all four.
    private void CrossSums4(double[] a, double[] y0, double[] y1, double[] y2, double[] y3, Span<double> sums, int rows)
    {
        const int w = 8;
        var blocks = Blocks;
        var length = rows * blocks;
        if (a.Length < length || y0.Length < length || y1.Length < length || y2.Length < length || y3.Length < length)
            throw new ArgumentException("A column is shorter than the positions summed.");
        ref var ra = ref MemoryMarshal.GetArrayDataReference(a);
        ref var r0 = ref MemoryMarshal.GetArrayDataReference(y0);
        ref var r1 = ref MemoryMarshal.GetArrayDataReference(y1);
        ref var r2 = ref MemoryMarshal.GetArrayDataReference(y2);
        ref var r3 = ref MemoryMarshal.GetArrayDataReference(y3);
        for (var lane = 0; lane < blocks; lane += w)
        {
            var acc0 = Vector512.Create(sums.Slice(lane, w));
            var acc1 = Vector512.Create(sums.Slice(blocks + lane, w));
            var acc2 = Vector512.Create(sums.Slice(2 * blocks + lane, w));
            var acc3 = Vector512.Create(sums.Slice(3 * blocks + lane, w));
            for (var o = (nuint)lane; o < (nuint)length; o += (nuint)blocks)
            {
                var x = Vector512.LoadUnsafe(ref ra, o);
                acc0 += x * Vector512.LoadUnsafe(ref r0, o);
                acc1 += x * Vector512.LoadUnsafe(ref r1, o);
                acc2 += x * Vector512.LoadUnsafe(ref r2, o);
                acc3 += x * Vector512.LoadUnsafe(ref r3, o);
            }
            acc0.CopyTo(sums.Slice(lane, w));
            acc1.CopyTo(sums.Slice(blocks + lane, w));
            acc2.CopyTo(sums.Slice(2 * blocks + lane, w));
            acc3.CopyTo(sums.Slice(3 * blocks + lane, w));
        }
    }

    // Two columns at once (sums[0..B) for y0, sums[B..2B) for y1): a's vector is loaded once for both.
    private void LaneCrossSums2(double[] a, double[] y0, double[] y1, Span<double> sums, int rows)
    {
        var w = Vector<double>.Count;
        var blocks = Blocks;
        var av = MemoryMarshal.Cast<double, Vector<double>>(a.AsSpan(0, rows * blocks));
        var y0v = MemoryMarshal.Cast<double, Vector<double>>(y0.AsSpan(0, rows * blocks));
        var y1v = MemoryMarshal.Cast<double, Vector<double>>(y1.AsSpan(0, rows * blocks));
        var perRow = blocks / w;
        for (var lane = 0; lane < perRow; lane++)
        {
            var acc0 = new Vector<double>(sums.Slice(lane * w, w));
            var acc1 = new Vector<double>(sums.Slice(blocks + lane * w, w));
            for (int t = 0, i = lane; t < rows; t++, i += perRow)
            {
                var x = av[i];
                acc0 += x * y0v[i];
                acc1 += x * y1v[i];
            }
            acc0.CopyTo(sums.Slice(lane * w, w));
            acc1.CopyTo(sums.Slice(blocks + lane * w, w));
        }
    }
}
