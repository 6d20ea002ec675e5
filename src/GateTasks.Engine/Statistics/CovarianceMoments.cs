using System.Numerics;
using System.Runtime.InteropServices;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Weighted mean vector and co-moment matrix C = Σ a (x − x̄)(x − x̄)ᵀ of d features for events whose weights all have
/// one sign, kept as magnitudes a = |w| so that Σa only grows away from zero (the sign is applied when two such sets are
/// joined, <see cref="GaussianFit.Join"/>). Parts are joined by the pairwise update of Chan, Golub &amp; LeVeque (1979),
/// written for co-moment matrices by Pébay (2008, SAND2008-6212): for parts A and B with
/// δ = x̄_B − x̄_A, x̄ = x̄_A + a_B/(a_A + a_B)·δ and C = C_A + C_B + a_A a_B/(a_A + a_B)·δδᵀ.
/// The matrix is held in full (d × d), symmetric.
/// </summary>
internal sealed class CovarianceMoments
{
    private readonly double[] _mean;
    private readonly double[] _comoments;

    public CovarianceMoments(int dimension)
    {
        if (dimension < 1) throw new ArgumentOutOfRangeException(nameof(dimension), dimension, "At least one feature is needed.");
        Dimension = dimension;
        _mean = new double[dimension];
        _comoments = new double[dimension * dimension];
    }

    /// <summary>Number of features d.</summary>
    public int Dimension { get; }

    /// <summary>Events with a non-zero weight added.</summary>
    public long Count { get; private set; }

    /// <summary>Σ|w| (never negative).</summary>
    public double SumOfWeights { get; private set; }

    /// <summary>Σw².</summary>
    public double SumOfSquaredWeights { get; private set; }

    /// <summary>Weighted mean (zeros while nothing was added).</summary>
    public ReadOnlySpan<double> Mean => _mean;

    /// <summary>Co-moment matrix Σ|w|(x − x̄)(x − x̄)ᵀ, row-major d × d.</summary>
    public ReadOnlySpan<double> Comoments => _comoments;

    /// <summary>How many numbers <see cref="WriteState"/> writes: count, Σ|w|, Σw², the mean and the lower triangle of C.</summary>
    public static int StateLength(int dimension) => 3 + dimension + dimension * (dimension + 1) / 2;

    /// <summary>
    /// Joins a part given by its count, Σ|w|, Σw², mean and full co-moment matrix (Chan, Golub &amp; LeVeque 1979).
    /// </summary>
    public void Merge(long count, double sumOfWeights, double sumOfSquaredWeights, ReadOnlySpan<double> mean, ReadOnlySpan<double> comoments)
    {
        if (count == 0 || sumOfWeights == 0) return;
        var d = Dimension;
        if (SumOfWeights == 0)
        {
            mean.CopyTo(_mean);
            comoments.CopyTo(_comoments);
            (Count, SumOfWeights, SumOfSquaredWeights) = (count, sumOfWeights, sumOfSquaredWeights);
            return;
        }
        var total = SumOfWeights + sumOfWeights;
        var factor = SumOfWeights * sumOfWeights / total;
        Span<double> delta = d <= 256 ? stackalloc double[d] : new double[d];
        for (var k = 0; k < d; k++) delta[k] = mean[k] - _mean[k];
        for (var p = 0; p < d; p++)
        {
            var row = _comoments.AsSpan(p * d, d);
            var other = comoments.Slice(p * d, d);
            var fp = factor * delta[p];
            for (var q = 0; q < d; q++) row[q] += other[q] + fp * delta[q];
        }
        var shift = sumOfWeights / total;
        for (var k = 0; k < d; k++) _mean[k] += shift * delta[k];
        Count += count;
        SumOfWeights = total;
        SumOfSquaredWeights += sumOfSquaredWeights;
    }

    /// <summary>Joins another accumulation of the same sign; equal to one pass to rounding.</summary>
    public void Merge(CovarianceMoments other)
    {
        if (other.Dimension != Dimension)
            throw new ArgumentException($"Cannot merge moments of {other.Dimension} features into moments of {Dimension}.", nameof(other));
        Merge(other.Count, other.SumOfWeights, other.SumOfSquaredWeights, other._mean, other._comoments);
    }

    /// <summary>A copy, for joining subsets of blocks without changing the blocks.</summary>
    public CovarianceMoments Copy()
    {
        var c = new CovarianceMoments(Dimension);
        c.Merge(this);
        return c;
    }

    /// <summary>Writes <see cref="StateLength"/> numbers (the lower triangle of the symmetric C, row by row).</summary>
    public void WriteState(Span<double> into)
    {
        var d = Dimension;
        (into[0], into[1], into[2]) = (Count, SumOfWeights, SumOfSquaredWeights);
        _mean.CopyTo(into.Slice(3, d));
        var i = 3 + d;
        for (var p = 0; p < d; p++)
            for (var q = 0; q <= p; q++)
                into[i++] = _comoments[p * d + q];
    }

    /// <summary>Sets the state <see cref="WriteState"/> wrote (symmetric C rebuilt from its lower triangle).</summary>
    public void ReadState(ReadOnlySpan<double> from)
    {
        var d = Dimension;
        (Count, SumOfWeights, SumOfSquaredWeights) = ((long)from[0], from[1], from[2]);
        from.Slice(3, d).CopyTo(_mean);
        var i = 3 + d;
        for (var p = 0; p < d; p++)
            for (var q = 0; q <= p; q++)
                _comoments[p * d + q] = _comoments[q * d + p] = from[i++];
    }

    /// <summary>Σ x_i y_i, vectorised: one co-moment's share of a chunk of rows.</summary>
    internal static double Dot(ReadOnlySpan<double> x, ReadOnlySpan<double> y)
    {
        var k = 0;
        var sum = 0.0;
        if (Vector.IsHardwareAccelerated && x.Length >= Vector<double>.Count)
        {
            var acc = Vector<double>.Zero;
            for (; k <= x.Length - Vector<double>.Count; k += Vector<double>.Count)
                acc += new Vector<double>(x[k..]) * new Vector<double>(y[k..]);
            sum = Vector.Sum(acc);
        }
        for (; k < x.Length; k++) sum += x[k] * y[k];
        return sum;
    }

    /// <summary>
    /// Four dot products of x with y0..y3 at once: x is loaded once per step and the four sums are independent
    /// (a single running sum would wait on its own additions).
    /// </summary>
    internal static (double, double, double, double) Dot4(ReadOnlySpan<double> x, ReadOnlySpan<double> y0, ReadOnlySpan<double> y1,
        ReadOnlySpan<double> y2, ReadOnlySpan<double> y3)
    {
        var k = 0;
        double s0 = 0, s1 = 0, s2 = 0, s3 = 0;
        if (Vector.IsHardwareAccelerated && x.Length >= Vector<double>.Count)
        {
            Vector<double> a0 = Vector<double>.Zero, a1 = a0, a2 = a0, a3 = a0;
            ref var rx = ref MemoryMarshal.GetReference(x);
            ref var r0 = ref MemoryMarshal.GetReference(y0);
            ref var r1 = ref MemoryMarshal.GetReference(y1);
            ref var r2 = ref MemoryMarshal.GetReference(y2);
            ref var r3 = ref MemoryMarshal.GetReference(y3);
            if (y0.Length < x.Length || y1.Length < x.Length || y2.Length < x.Length || y3.Length < x.Length)
                throw new ArgumentException("Every y needs at least x's length.");
            for (; k <= x.Length - Vector<double>.Count; k += Vector<double>.Count)
            {
                var at = (nuint)k;
                var v = Vector.LoadUnsafe(ref rx, at);
                a0 += v * Vector.LoadUnsafe(ref r0, at);
                a1 += v * Vector.LoadUnsafe(ref r1, at);
                a2 += v * Vector.LoadUnsafe(ref r2, at);
                a3 += v * Vector.LoadUnsafe(ref r3, at);
            }
            (s0, s1, s2, s3) = (Vector.Sum(a0), Vector.Sum(a1), Vector.Sum(a2), Vector.Sum(a3));
        }
        for (; k < x.Length; k++)
        {
            s0 += x[k] * y0[k];
            s1 += x[k] * y1[k];
            s2 += x[k] * y2[k];
            s3 += x[k] * y3[k];
        }
        return (s0, s1, s2, s3);
    }
}
