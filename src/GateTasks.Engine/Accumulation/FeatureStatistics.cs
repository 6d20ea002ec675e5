using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Streams one feature's finite values into weighted moments, minimum and maximum; NaN and infinite values are only
/// counted (whether they are allowed is the caller's decision).
/// </summary>
internal sealed class FeatureStatistics
{
    private readonly WeightedMoments _moments;

    public FeatureStatistics() : this(new WeightedMoments())
    {
    }

    private FeatureStatistics(WeightedMoments moments) => _moments = moments;

    /// <summary>An independent copy with the same state to the bit, for a feature that was given the same values.</summary>
    public FeatureStatistics Copy()
    {
        var copy = new FeatureStatistics(_moments.Copy())
        {
            Min = Min, Max = Max, NanCount = NanCount, PositiveInfinityCount = PositiveInfinityCount, NegativeInfinityCount = NegativeInfinityCount,
        };
        (copy._shift, copy._s0, copy._s1, copy._s2, copy._s3, copy._s4) = (_shift, _s0, _s1, _s2, _s3, _s4);
        return copy;
    }

    // Power sums of (x − shift) for the kurtosis; the shift (the first value) keeps the cancellation moderate.
    private double _shift = double.NaN, _s0, _s1, _s2, _s3, _s4;

    public double Min { get; private set; } = double.PositiveInfinity;
    public double Max { get; private set; } = double.NegativeInfinity;
    public long NanCount { get; private set; }
    public long PositiveInfinityCount { get; private set; }
    public long NegativeInfinityCount { get; private set; }
    public long Count => _moments.Count;

    public void Add(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        if (weights.IsEmpty)
        {
            AddUnitWeights(values);
            return;
        }
        for (var r = 0; r < values.Length; r++)
        {
            var x = values[r];
            if (double.IsNaN(x)) { NanCount++; continue; }
            if (double.IsPositiveInfinity(x)) { PositiveInfinityCount++; continue; }
            if (double.IsNegativeInfinity(x)) { NegativeInfinityCount++; continue; }
            var w = weights.IsEmpty ? 1.0 : weights[r];
            _moments.Add(x, w);
            if (double.IsNaN(_shift)) _shift = x;
            var d = x - _shift;
            var d2 = d * d;
            _s0 += w;
            _s1 += w * d;
            _s2 += w * d2;
            _s3 += w * d2 * d;
            _s4 += w * d2 * d2;
            if (x < Min) Min = x;
            if (x > Max) Max = x;
        }
    }

    /// <summary>
    /// Unit weights, a batch at a time: the batch's mean and squared deviations in two passes, merged into the running
    /// moments once (Chan, Golub &amp; LeVeque 1979), which spares the per-value division of the running update. Both
    /// passes run over SIMD lanes (NaN and infinities masked out and counted), the sums added up lane by lane: the
    /// order of additions depends on the batch only, never on threads.
    /// </summary>
    private void AddUnitWeights(ReadOnlySpan<double> values)
    {
        var whole = values.Length - values.Length % Vector<double>.Count;
        var first = FirstSums.Empty;
        First(values[..whole], ref first);
        if (FinishFirst(ref first, values[whole..], values) is not { } mean) return;
        var second = default(SecondSums);
        Second(values[..whole], mean, _shift, ref second);
        FinishSecond(ref second, values[whole..], mean);
    }

    /// <summary>
    /// Unit weights, the values stored as float32: the same sums in the same order as <see cref="Add(ReadOnlySpan{double}, ReadOnlySpan{double})"/>
    /// with the values converted first (widening is exact), widened a block at a time on the stack instead.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Add(ReadOnlySpan<float> values)
    {
        var lanes = Vector<double>.Count;
        var whole = values.Length - values.Length % lanes;
        Span<double> block = stackalloc double[WidenBlock];
        Span<double> tail = stackalloc double[lanes];
        var rest = tail[..(values.Length - whole)];
        Widen(values[whole..], rest);
        // Where a Vector<double> is four lanes, eight floats are widened in registers into two of them, taken in
        // order; the rest (and other register widths) through a block widened on the stack.
        var fused = Vector<double>.Count == 4 && Vector256.IsHardwareAccelerated ? whole - whole % 8 : 0;
        var first = FirstSums.Empty;
        if (fused > 0) FirstFused(values[..fused], ref first);
        for (var i = fused; i < whole; i += WidenBlock)
        {
            var n = Math.Min(WidenBlock, whole - i);
            Widen(values.Slice(i, n), block);
            First(block[..n], ref first);
        }
        if (FinishFirst(ref first, rest, values) is not { } mean) return;
        var second = default(SecondSums);
        if (fused > 0) SecondFused(values[..fused], mean, _shift, ref second);
        for (var i = fused; i < whole; i += WidenBlock)
        {
            var n = Math.Min(WidenBlock, whole - i);
            Widen(values.Slice(i, n), block);
            Second(block[..n], mean, _shift, ref second);
        }
        FinishSecond(ref second, rest, mean);
    }

    // First, for floats eight at a time (Vector<double> of four lanes): the lower four, then the upper four.
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void FirstFused(ReadOnlySpan<float> values, ref FirstSums sums)
    {
        var zero = Vector<double>.Zero;
        var one = Vector<double>.One;
        var plusInfinity = new Vector<double>(double.PositiveInfinity);
        var minusInfinity = new Vector<double>(double.NegativeInfinity);
        var (vSum, vCount, vPlus, vMinus, vMin, vMax) = (sums.Sum, sums.Count, sums.Plus, sums.Minus, sums.Min, sums.Max);
        ref var v0 = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(values);
        for (var i = 0; i + 8 <= values.Length; i += 8)
        {
            var (lower, upper) = Vector256.Widen(Vector256.LoadUnsafe(ref v0, (nuint)i));
            var v = lower.AsVector();
            var finite = Vector.LessThan(Vector.Abs(v), plusInfinity);
            vSum += Vector.ConditionalSelect(finite, v, zero);
            vCount += Vector.ConditionalSelect(finite, one, zero);
            vPlus += Vector.ConditionalSelect(Vector.Equals(v, plusInfinity), one, zero);
            vMinus += Vector.ConditionalSelect(Vector.Equals(v, minusInfinity), one, zero);
            vMin = Vector.Min(vMin, Vector.ConditionalSelect(finite, v, plusInfinity));
            vMax = Vector.Max(vMax, Vector.ConditionalSelect(finite, v, minusInfinity));
            v = upper.AsVector();
            finite = Vector.LessThan(Vector.Abs(v), plusInfinity);
            vSum += Vector.ConditionalSelect(finite, v, zero);
            vCount += Vector.ConditionalSelect(finite, one, zero);
            vPlus += Vector.ConditionalSelect(Vector.Equals(v, plusInfinity), one, zero);
            vMinus += Vector.ConditionalSelect(Vector.Equals(v, minusInfinity), one, zero);
            vMin = Vector.Min(vMin, Vector.ConditionalSelect(finite, v, plusInfinity));
            vMax = Vector.Max(vMax, Vector.ConditionalSelect(finite, v, minusInfinity));
        }
        (sums.Sum, sums.Count, sums.Plus, sums.Minus, sums.Min, sums.Max) = (vSum, vCount, vPlus, vMinus, vMin, vMax);
    }

    // Second, for floats eight at a time (Vector<double> of four lanes): the lower four, then the upper four.
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void SecondFused(ReadOnlySpan<float> values, double mean, double shift, ref SecondSums sums)
    {
        var zero = Vector<double>.Zero;
        var plusInfinity = new Vector<double>(double.PositiveInfinity);
        var vMean = new Vector<double>(mean);
        var vShift = new Vector<double>(shift);
        var (vM2, v1, v2, v3, v4) = (sums.M2, sums.S1, sums.S2, sums.S3, sums.S4);
        ref var v0 = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(values);
        for (var i = 0; i + 8 <= values.Length; i += 8)
        {
            var (lower, upper) = Vector256.Widen(Vector256.LoadUnsafe(ref v0, (nuint)i));
            var v = lower.AsVector();
            var finite = Vector.LessThan(Vector.Abs(v), plusInfinity);
            var dm = Vector.ConditionalSelect(finite, v - vMean, zero);
            vM2 += dm * dm;
            var d = Vector.ConditionalSelect(finite, v - vShift, zero);
            var d2 = d * d;
            v1 += d;
            v2 += d2;
            v3 += d2 * d;
            v4 += d2 * d2;
            v = upper.AsVector();
            finite = Vector.LessThan(Vector.Abs(v), plusInfinity);
            dm = Vector.ConditionalSelect(finite, v - vMean, zero);
            vM2 += dm * dm;
            d = Vector.ConditionalSelect(finite, v - vShift, zero);
            d2 = d * d;
            v1 += d;
            v2 += d2;
            v3 += d2 * d;
            v4 += d2 * d2;
        }
        (sums.M2, sums.S1, sums.S2, sums.S3, sums.S4) = (vM2, v1, v2, v3, v4);
    }

    /// <summary>Values widened at a time by <see cref="Add(ReadOnlySpan{float})"/>: a whole number of SIMD registers.</summary>
    private const int WidenBlock = 512;

    // float → double is exact; a register at a time where the processor has them.
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Widen(ReadOnlySpan<float> values, Span<double> destination)
    {
        if (destination.Length < values.Length) throw new ArgumentException("Destination too short.", nameof(destination));
        ref var v0 = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(values);
        ref var d0 = ref System.Runtime.InteropServices.MemoryMarshal.GetReference(destination);
        var i = 0;
        if (Vector512.IsHardwareAccelerated)
            for (; i + 16 <= values.Length; i += 16)
            {
                var (lower, upper) = Vector512.Widen(Vector512.LoadUnsafe(ref v0, (nuint)i));
                lower.StoreUnsafe(ref d0, (nuint)i);
                upper.StoreUnsafe(ref d0, (nuint)(i + 8));
            }
        else if (Vector256.IsHardwareAccelerated)
            for (; i + 8 <= values.Length; i += 8)
            {
                var (lower, upper) = Vector256.Widen(Vector256.LoadUnsafe(ref v0, (nuint)i));
                lower.StoreUnsafe(ref d0, (nuint)i);
                upper.StoreUnsafe(ref d0, (nuint)(i + 4));
            }
        for (; i < values.Length; i++) destination[i] = values[i];
    }

    // The first pass's lane sums: Σx, count, +∞ and −∞ counts, minimum and maximum of the finite values.
    private struct FirstSums
    {
        public Vector<double> Sum, Count, Plus, Minus, Min, Max;

        public static FirstSums Empty => new()
        {
            Min = new Vector<double>(double.PositiveInfinity),
            Max = new Vector<double>(double.NegativeInfinity),
        };
    }

    // The second pass's lane sums: squared deviations from the batch mean, power sums of (x − shift).
    private struct SecondSums
    {
        public Vector<double> M2, S1, S2, S3, S4;
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void First(ReadOnlySpan<double> values, ref FirstSums sums)
    {
        var lanes = Vector<double>.Count;
        var zero = Vector<double>.Zero;
        var one = Vector<double>.One;
        var plusInfinity = new Vector<double>(double.PositiveInfinity);
        var minusInfinity = new Vector<double>(double.NegativeInfinity);
        var (vSum, vCount, vPlus, vMinus, vMin, vMax) = (sums.Sum, sums.Count, sums.Plus, sums.Minus, sums.Min, sums.Max);
        for (var i = 0; i + lanes <= values.Length; i += lanes)
        {
            var v = new Vector<double>(values.Slice(i, lanes));
            var finite = Vector.LessThan(Vector.Abs(v), plusInfinity); // false for NaN and ±∞
            vSum += Vector.ConditionalSelect(finite, v, zero);
            vCount += Vector.ConditionalSelect(finite, one, zero);
            vPlus += Vector.ConditionalSelect(Vector.Equals(v, plusInfinity), one, zero);
            vMinus += Vector.ConditionalSelect(Vector.Equals(v, minusInfinity), one, zero);
            vMin = Vector.Min(vMin, Vector.ConditionalSelect(finite, v, plusInfinity));
            vMax = Vector.Max(vMax, Vector.ConditionalSelect(finite, v, minusInfinity));
        }
        (sums.Sum, sums.Count, sums.Plus, sums.Minus, sums.Min, sums.Max) = (vSum, vCount, vPlus, vMinus, vMin, vMax);
    }

    // Adds the lanes and the tail (fewer values than a register) to the counts and extremes; sets the shift at the
    // batch's first finite value if there is none yet; returns the batch mean, or null when no value is finite.
    private double? FinishFirst(ref FirstSums sums, ReadOnlySpan<double> tail, ReadOnlySpan<double> values) =>
        FinishFirst(ref sums, tail, values.Length, FirstFinite(values));

    private double? FinishFirst(ref FirstSums sums, ReadOnlySpan<double> tail, ReadOnlySpan<float> values) =>
        FinishFirst(ref sums, tail, values.Length, FirstFinite(values));

    private double? FinishFirst(ref FirstSums sums, ReadOnlySpan<double> tail, int length, double firstFinite)
    {
        double sum = Vector.Sum(sums.Sum), n = Vector.Sum(sums.Count), plus = Vector.Sum(sums.Plus), minus = Vector.Sum(sums.Minus), min = Min, max = Max;
        for (var k = 0; k < Vector<double>.Count; k++)
        {
            min = Math.Min(min, sums.Min[k]);
            max = Math.Max(max, sums.Max[k]);
        }
        foreach (var x in tail)
        {
            if (double.IsPositiveInfinity(x)) plus++;
            else if (double.IsNegativeInfinity(x)) minus++;
            if (!double.IsFinite(x)) continue;
            n++;
            sum += x;
            min = Math.Min(min, x);
            max = Math.Max(max, x);
        }
        var count = (long)n;
        PositiveInfinityCount += (long)plus;
        NegativeInfinityCount += (long)minus;
        NanCount += length - count - (long)plus - (long)minus;
        if (count == 0) return null;
        if (double.IsNaN(_shift)) _shift = firstFinite;
        Min = min;
        Max = max;
        _pendingCount = count;
        return sum / count;
    }

    private static double FirstFinite(ReadOnlySpan<double> values)
    {
        foreach (var x in values)
            if (double.IsFinite(x)) return x;
        return double.NaN;
    }

    private static double FirstFinite(ReadOnlySpan<float> values)
    {
        foreach (var x in values)
            if (float.IsFinite(x)) return x;
        return double.NaN;
    }

    // The batch's finite values, between the two passes.
    private long _pendingCount;

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Second(ReadOnlySpan<double> values, double mean, double shift, ref SecondSums sums)
    {
        var lanes = Vector<double>.Count;
        var zero = Vector<double>.Zero;
        var plusInfinity = new Vector<double>(double.PositiveInfinity);
        var vMean = new Vector<double>(mean);
        var vShift = new Vector<double>(shift);
        var (vM2, v1, v2, v3, v4) = (sums.M2, sums.S1, sums.S2, sums.S3, sums.S4);
        for (var i = 0; i + lanes <= values.Length; i += lanes)
        {
            var v = new Vector<double>(values.Slice(i, lanes));
            var finite = Vector.LessThan(Vector.Abs(v), plusInfinity);
            var dm = Vector.ConditionalSelect(finite, v - vMean, zero);
            vM2 += dm * dm;
            var d = Vector.ConditionalSelect(finite, v - vShift, zero);
            var d2 = d * d;
            v1 += d;
            v2 += d2;
            v3 += d2 * d;
            v4 += d2 * d2;
        }
        (sums.M2, sums.S1, sums.S2, sums.S3, sums.S4) = (vM2, v1, v2, v3, v4);
    }

    private void FinishSecond(ref SecondSums sums, ReadOnlySpan<double> tail, double mean)
    {
        var shift = _shift;
        double m2 = Vector.Sum(sums.M2), s1 = Vector.Sum(sums.S1), s2 = Vector.Sum(sums.S2), s3 = Vector.Sum(sums.S3), s4 = Vector.Sum(sums.S4);
        foreach (var x in tail)
        {
            if (!double.IsFinite(x)) continue;
            var dm = x - mean;
            m2 += dm * dm;
            var d = x - shift;
            var d2 = d * d;
            s1 += d;
            s2 += d2;
            s3 += d2 * d;
            s4 += d2 * d2;
        }
        var count = _pendingCount;
        _moments.AddBatch(count, mean, m2);
        _s0 += count;
        _s1 += s1;
        _s2 += s2;
        _s3 += s3;
        _s4 += s4;
    }

    /// <summary>
    /// Adds another feature's statistics: moments by the pairwise update of Chan, Golub &amp; LeVeque (1979), power sums
    /// re-centred on this shift by the binomial expansion, extremes and NaN counts. Agrees with one pass to rounding.
    /// </summary>
    public void Merge(FeatureStatistics other)
    {
        _moments.Merge(other._moments);
        NanCount += other.NanCount;
        PositiveInfinityCount += other.PositiveInfinityCount;
        NegativeInfinityCount += other.NegativeInfinityCount;
        Min = Math.Min(Min, other.Min);
        Max = Math.Max(Max, other.Max);
        if (double.IsNaN(other._shift)) return;
        if (double.IsNaN(_shift)) _shift = other._shift;
        // Σw(x − a)^k = Σ_j C(k, j)·(b − a)^(k−j)·Σw(x − b)^j, with a this shift and b the other's.
        var d = other._shift - _shift;
        double o0 = other._s0, o1 = other._s1, o2 = other._s2, o3 = other._s3, o4 = other._s4;
        _s0 += o0;
        _s1 += o1 + d * o0;
        _s2 += o2 + 2 * d * o1 + d * d * o0;
        _s3 += o3 + 3 * d * o2 + 3 * d * d * o1 + d * d * d * o0;
        _s4 += o4 + 4 * d * o3 + 6 * d * d * o2 + 4 * d * d * d * o1 + d * d * d * d * o0;
    }

    /// <summary>The whole state as numbers, for a partial file (<see cref="Restore"/> reads it back).</summary>
    public double[] State() => [.. _moments.State(), _shift, _s0, _s1, _s2, _s3, _s4, Min, Max, NanCount, PositiveInfinityCount, NegativeInfinityCount];

    public static FeatureStatistics Restore(ReadOnlySpan<double> s)
    {
        var f = new FeatureStatistics();
        f._moments.Restore(s[..6]);
        (f._shift, f._s0, f._s1, f._s2, f._s3, f._s4) = (s[6], s[7], s[8], s[9], s[10], s[11]);
        (f.Min, f.Max, f.NanCount) = (s[12], s[13], (long)s[14]);
        // Partial files written before infinities were counted have no such entries (none were let through then).
        if (s.Length >= 17) (f.PositiveInfinityCount, f.NegativeInfinityCount) = ((long)s[15], (long)s[16]);
        return f;
    }

    public FeatureSummary Summary() =>
        new(_moments.Count, _moments.SumOfWeights, _moments.SumOfSquaredWeights, _moments.Mean, _moments.StandardDeviation, Min, Max, NanCount, Kurtosis())
        {
            PositiveInfinityCount = PositiveInfinityCount,
            NegativeInfinityCount = NegativeInfinityCount,
        };

    /// <summary>μ₄/σ⁴ from the shifted power sums (central moments by binomial expansion); NaN without spread.</summary>
    private double Kurtosis()
    {
        if (!(_s0 > 0)) return double.NaN;
        var m1 = _s1 / _s0;
        var m2 = _s2 / _s0 - m1 * m1;
        var m4 = _s4 / _s0 - 4 * m1 * _s3 / _s0 + 6 * m1 * m1 * _s2 / _s0 - 3 * m1 * m1 * m1 * m1;
        return m2 > 0 ? Math.Max(1, m4 / (m2 * m2)) : double.NaN;
    }
}
