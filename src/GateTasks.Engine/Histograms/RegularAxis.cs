using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace GateTasks.Engine.Histograms;

/// <summary>Equal-width bins between two limits; the bin index is computed, not searched.</summary>
internal sealed class RegularAxis : Axis
{
    private readonly double[] _edges;
    private readonly double _lower;
    private readonly double _upper;
    private readonly double _scale;
    private readonly bool _divideFirst;
    private readonly float[]? _float32Edges; // for counting float values in SIMD registers (EdgeCountSearch)

    /// <summary>Creates <paramref name="count"/> equal bins over [lower, upper).</summary>
    public RegularAxis(int count, double lower, double upper)
    {
        if (count < 1) throw new ArgumentOutOfRangeException(nameof(count), "An axis needs at least one bin.");
        if (!double.IsFinite(lower) || !double.IsFinite(upper) || !(upper > lower) || !double.IsFinite(upper - lower))
            throw new ArgumentException($"Axis limits must be finite and increasing, with a finite width, got [{lower}, {upper}).");
        _lower = lower;
        _upper = upper;
        _scale = count / (upper - lower);
        _edges = new double[count + 1];
        // (upper − lower)·i overflows for widths near the largest double; such axes divide first (and bin by the
        // scalar lookup, whose stored edges are what the vectorised one would otherwise recompute).
        _divideFirst = !double.IsFinite((upper - lower) * count);
        for (var i = 0; i <= count; i++) _edges[i] = _divideFirst ? lower + (upper - lower) / count * i : lower + (upper - lower) * i / count;
        _edges[count] = upper;
        _float32Edges = CountingEdges(_edges);
    }

    /// <inheritdoc />
    public override int Count => _edges.Length - 1;

    /// <inheritdoc />
    public override ReadOnlySpan<double> Edges => _edges;

    /// <inheritdoc />
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public override int Index(double value)
    {
        if (value < _lower) return Underflow;
        if (value >= _upper) return Count;
        var i = (int)((value - _lower) * _scale);
        // Rounding in the product can land one bin off next to an edge; the stored edges decide.
        if (i >= Count) i = Count - 1;
        if (value < _edges[i]) i--;
        else if (value >= _edges[i + 1]) i++;
        return i;
    }

    /// <inheritdoc />
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public override void Cells(ReadOnlySpan<double> values, Span<int> cells, int nanCell)
    {
        var i = 0;
        if (Avx.IsSupported && !_divideFirst) i = CellsAvx(values, cells, nanCell);
        for (; i < values.Length; i++)
        {
            var v = values[i];
            cells[i] = double.IsNaN(v) ? nanCell : Index(v) + 1;
        }
    }

    /// <inheritdoc />
    /// <remarks>
    /// Float values of an axis of few edges are counted against the stored edges (<see cref="EdgeCountSearch"/>),
    /// which gives the cells of a binary search over them, as <see cref="Index"/> does.
    /// </remarks>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public override void Cells(ReadOnlySpan<float> values, Span<int> cells, int nanCell)
    {
        var i = _float32Edges is { } edges ? EdgeCountSearch.Cells(values, edges, cells, nanCell) : 0;
        for (; i < values.Length; i++)
        {
            var v = values[i];
            cells[i] = float.IsNaN(v) ? nanCell : Index(v) + 1;
        }
    }

    /// <summary>
    /// Four values at a time: the same bin as <see cref="Index"/> to the bit, with the two edges that correct the
    /// rounded index computed as the constructor computes them (lower + (upper − lower)·i/count, the last edge being
    /// upper itself). A group holding a value outside the range, or NaN, is left to the scalar loop. Returns how many
    /// values were done.
    /// </summary>
    private int CellsAvx(ReadOnlySpan<double> values, Span<int> cells, int nanCell)
    {
        var lower = Vector256.Create(_lower);
        var upper = Vector256.Create(_upper);
        var scale = Vector256.Create(_scale);
        var width = Vector256.Create(_upper - _lower);
        var count = Vector256.Create((double)Count);
        var lastBin = Vector256.Create((double)(Count - 1));
        var one = Vector256.Create(1.0);
        var i = 0;
        for (; i + 4 <= values.Length; i += 4)
        {
            var v = Vector256.Create(values.Slice(i, 4));
            // In range: lower ≤ v < upper (false for NaN).
            var inside = Avx.And(Avx.CompareGreaterThanOrEqual(v, lower), Avx.CompareLessThan(v, upper));
            if (Avx.MoveMask(inside) != 0b1111)
            {
                for (var k = i; k < i + 4; k++) cells[k] = double.IsNaN(values[k]) ? nanCell : Index(values[k]) + 1;
                continue;
            }
            var bin = Avx.Min(Avx.RoundToZero(Avx.Multiply(Avx.Subtract(v, lower), scale)), lastBin);
            var low = Avx.Add(lower, Avx.Divide(Avx.Multiply(width, bin), count));
            var next = Avx.Add(bin, one);
            var high = Avx.BlendVariable(Avx.Add(lower, Avx.Divide(Avx.Multiply(width, next), count)), upper, Avx.CompareEqual(next, count));
            // Index: one down below the lower edge, one up at or above the upper edge; the cell is the index + 1.
            var cell = Avx.Add(next, Avx.Subtract(Avx.And(Avx.CompareGreaterThanOrEqual(v, high), one), Avx.And(Avx.CompareLessThan(v, low), one)));
            Avx.ConvertToVector128Int32WithTruncation(cell).CopyTo(cells.Slice(i, 4));
        }
        return i;
    }
}
