using System.Numerics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Weighted sums of the finite feature map of the cubic polynomial kernel k(x, y) = (x·y/d + 1)³ over a set of rows
/// of d features: the kernel of the kernel inception distance (Bińkowski, Sutherland, Arbel &amp; Gretton 2018,
/// "Demystifying MMD GANs", ICLR) that Kansal et al. (2023, "Evaluating generative models in high energy physics",
/// Phys. Rev. D 107, 076017) use as their kernel physics distance. By the binomial and multinomial theorems
/// (1 + u)³ = Σ_k C(3, k) u^k and (x·y)^k = Σ_{|α|=k} k!/α! x^α y^α, so
/// k(x, y) = Σ_{|α|≤3} c_α x^α y^α with c_α = C(3, |α|) · |α|!/α! / d^|α|: an inner product of the C(d+3, 3)
/// monomials of degree ≤ 3 (Schölkopf &amp; Smola 2002, "Learning with kernels", §2.1). Hence for two row sets
/// Σᵢ Σⱼ wᵢ vⱼ k(xᵢ, yⱼ) = Σ_α c_α (Σᵢ wᵢ xᵢ^α)(Σⱼ vⱼ yⱼ^α): one pass over each set at C(d+3, 3) multiply-adds
/// a row instead of a pass over all pairs. The sums are additive, so sets can be filled in any order, in batches or
/// in shards and merged; memory does not depend on the number of rows.
/// Besides the monomial sums the set keeps Σw, Σw² and Σ w² k(x, x), which the unbiased estimator needs to drop the
/// i = j terms.
/// </summary>
internal sealed class CubicKernelFeatureSums
{
    /// <summary>Rows buffered before they are folded into the sums: long enough for SIMD dot products, short enough for the cache.</summary>
    internal const int BufferRows = 256;

    // Monomials in the order: 1; x_i (i < d); x_i x_j (i ≤ j); x_i x_j x_k (i ≤ j ≤ k), lexicographic.
    private readonly double[] _sums;
    private readonly double[] _coefficients;
    // Buffered rows by column (feature f at f·BufferRows), their weights, and scratch for w·x_i and w·x_i·x_j.
    private readonly double[] _columns;
    private readonly double[] _weights = new double[BufferRows];
    private readonly double[] _weightedColumns;
    private readonly double[] _product = new double[BufferRows];
    private int _buffered;

    /// <summary>An empty set for rows of <paramref name="width"/> features.</summary>
    internal CubicKernelFeatureSums(int width)
    {
        if (width < 1)
            throw new ArgumentOutOfRangeException(nameof(width), width, "Rows need at least one feature.");
        Width = width;
        _sums = new double[FeatureCount(width)];
        _coefficients = Coefficients(width);
        _columns = new double[width * BufferRows];
        _weightedColumns = new double[width * BufferRows];
    }

    /// <summary>Features per row (d).</summary>
    internal int Width { get; }

    /// <summary>Rows added (zero weights included).</summary>
    internal long Count { get; private set; }

    /// <summary>Σw over the rows added.</summary>
    internal double WeightSum { get; private set; }

    /// <summary>Σw² over the rows added.</summary>
    internal double WeightSquareSum { get; private set; }

    /// <summary>Σ w² k(x, x) over the rows added: the i = j terms of the double sum over the set with itself.</summary>
    internal double SelfKernelSum { get; private set; }

    /// <summary>The number of monomials of degree ≤ 3 in d variables, C(d+3, 3): the feature map's length.</summary>
    internal static int FeatureCount(int width) => checked((int)((long)(width + 3) * (width + 2) * (width + 1) / 6));

    /// <summary>The kernel itself, k(a, b) = (a·b/d + 1)³, d the common length.</summary>
    internal static double Kernel(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        if (a.Length != b.Length)
            throw new ArgumentException($"Rows of {a.Length} and {b.Length} features.", nameof(b));
        double u = Dot(a, b) / a.Length + 1;
        return u * u * u;
    }

    /// <summary>
    /// Adds one row with its weight (any finite value, negative allowed; the caller checks finiteness). Rows are held
    /// in a small column buffer and folded into the monomial sums <see cref="BufferRows"/> at a time, where each sum
    /// is a SIMD dot product over the buffered rows instead of one scalar update a row.
    /// </summary>
    internal void Add(ReadOnlySpan<double> row, double weight) => Add(row, weight, weight * weight, 1);

    /// <summary>
    /// Adds <paramref name="count"/> rows of equal values whose weights sum to <paramref name="weightSum"/> and whose
    /// squared weights sum to <paramref name="weightSquareSum"/>: the monomial sums take the values once with weight
    /// Σw, while Σw², Σ w² k(x, x) and the row count take each row, so the i ≠ j pairs between those rows count as they
    /// would had the rows been added one by one. With one row (Σw = w, Σw² = w·w) the arithmetic is that of adding it.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    internal void Add(ReadOnlySpan<double> row, double weightSum, double weightSquareSum, long count)
    {
        if (count < 1) throw new ArgumentOutOfRangeException(nameof(count), count, "At least one row.");
        if (row.Length != Width)
            throw new ArgumentException($"A row of {row.Length} features added to sums over {Width}.", nameof(row));
        int d = Width;
        Count += count;
        WeightSum += weightSum;
        WeightSquareSum += weightSquareSum;
        double squaredNorm = 0;
        for (int f = 0; f < d; f++)
        {
            squaredNorm += row[f] * row[f];
            _columns[f * BufferRows + _buffered] = row[f];
        }
        double self = squaredNorm / d + 1;
        SelfKernelSum += weightSquareSum * self * self * self;
        _weights[_buffered] = weightSum;
        if (++_buffered == BufferRows) Flush();
    }

    /// <summary>Adds every row of another set over the same width (shards, blocks).</summary>
    internal void Merge(CubicKernelFeatureSums other)
    {
        ArgumentNullException.ThrowIfNull(other);
        if (other.Width != Width)
            throw new ArgumentException($"Sums over {other.Width} features merged into sums over {Width}.", nameof(other));
        Flush();
        other.Flush();
        for (int a = 0; a < _sums.Length; a++) _sums[a] += other._sums[a];
        Count += other.Count;
        WeightSum += other.WeightSum;
        WeightSquareSum += other.WeightSquareSum;
        SelfKernelSum += other.SelfKernelSum;
    }

    /// <summary>How many numbers <see cref="State"/> gives for rows of <paramref name="width"/> features.</summary>
    internal static int StateLength(int width) => 5 + FeatureCount(width);

    /// <summary>
    /// The whole set as numbers, for a partial or reference file: d, the row count, Σw, Σw², Σ w² k(x, x), then the
    /// C(d+3, 3) monomial sums (buffered rows folded in first).
    /// </summary>
    internal double[] State()
    {
        Flush();
        var s = new double[StateLength(Width)];
        (s[0], s[1], s[2], s[3], s[4]) = (Width, Count, WeightSum, WeightSquareSum, SelfKernelSum);
        _sums.CopyTo(s.AsSpan(5));
        return s;
    }

    /// <summary>
    /// Replaces this set's contents by a state <see cref="State"/> gave; false (nothing changed) when the numbers are
    /// not of that form for this width (wrong length, width, or a count that is not a whole non-negative number).
    /// </summary>
    internal bool Restore(ReadOnlySpan<double> s)
    {
        if (s.Length != StateLength(Width) || s[0] != Width || !(s[1] >= 0) || s[1] != Math.Floor(s[1]) || s[1] > long.MaxValue) return false;
        _buffered = 0;
        Count = (long)s[1];
        (WeightSum, WeightSquareSum, SelfKernelSum) = (s[2], s[3], s[4]);
        s[5..].CopyTo(_sums);
        return true;
    }

    /// <summary>Σᵢ Σⱼ wᵢ vⱼ k(xᵢ, yⱼ) over all pairs of a row of this set and a row of <paramref name="other"/>.</summary>
    internal double PairSum(CubicKernelFeatureSums other)
    {
        ArgumentNullException.ThrowIfNull(other);
        if (other.Width != Width)
            throw new ArgumentException($"Sums over {other.Width} and {Width} features.", nameof(other));
        Flush();
        other.Flush();
        double total = 0;
        for (int a = 0; a < _sums.Length; a++) total += _coefficients[a] * _sums[a] * other._sums[a];
        return total;
    }

    /// <summary>Σ_{i≠j} wᵢ wⱼ k(xᵢ, xⱼ) over ordered pairs of distinct rows of this set.</summary>
    internal double DistinctPairSum() => PairSum(this) - SelfKernelSum;

    /// <summary>Σ_{i≠j} wᵢ wⱼ = (Σw)² − Σw², the normaliser of <see cref="DistinctPairSum"/>.</summary>
    internal double DistinctPairWeight => WeightSum * WeightSum - WeightSquareSum;

    /// <summary>Folds the buffered rows into the monomial sums.</summary>
    // Fully optimised from the first call: the sample's subsample is summed once, at the end of a run, too few calls
    // for tiered compilation to replace the unoptimised first version in time.
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    private void Flush()
    {
        int r = _buffered;
        if (r == 0) return;
        int d = Width;
        Span<double> sums = _sums;
        ReadOnlySpan<double> w = _weights.AsSpan(0, r);
        Span<double> product = _product.AsSpan(0, r);
        sums[0] += Sum(w);
        int quadratic = 1 + d, cubic = quadratic + d * (d + 1) / 2;
        for (int i = 0; i < d; i++)
        {
            Span<double> wi = _weightedColumns.AsSpan(i * BufferRows, r);
            Multiply(w, Column(i, r), wi);
            sums[1 + i] += Sum(wi);
        }
        for (int i = 0; i < d; i++)
        {
            ReadOnlySpan<double> wi = _weightedColumns.AsSpan(i * BufferRows, r);
            for (int j = i; j < d; j++)
            {
                Multiply(wi, Column(j, r), product);
                sums[quadratic++] += Sum(product);
                for (int k = j; k < d; k++) sums[cubic++] += Dot(product, Column(k, r));
            }
        }
        _buffered = 0;
    }

    private ReadOnlySpan<double> Column(int f, int rows) => _columns.AsSpan(f * BufferRows, rows);

    private static void Multiply(ReadOnlySpan<double> a, ReadOnlySpan<double> b, Span<double> result)
    {
        int k = 0;
        for (; k <= a.Length - Vector<double>.Count; k += Vector<double>.Count)
            (new Vector<double>(a[k..]) * new Vector<double>(b[k..])).CopyTo(result[k..]);
        for (; k < a.Length; k++) result[k] = a[k] * b[k];
    }

    private static double Sum(ReadOnlySpan<double> a)
    {
        var sum = Vector<double>.Zero;
        int k = 0;
        for (; k <= a.Length - Vector<double>.Count; k += Vector<double>.Count) sum += new Vector<double>(a[k..]);
        double s = Vector.Sum(sum);
        for (; k < a.Length; k++) s += a[k];
        return s;
    }

    private static double Dot(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var sum = Vector<double>.Zero;
        int k = 0;
        for (; k <= a.Length - Vector<double>.Count; k += Vector<double>.Count)
            sum += new Vector<double>(a[k..]) * new Vector<double>(b[k..]);
        double s = Vector.Sum(sum);
        for (; k < a.Length; k++) s += a[k] * b[k];
        return s;
    }

    /// <summary>c_α in the monomial order of the sums: C(3, |α|) · |α|!/α! / d^|α|.</summary>
    private static double[] Coefficients(int d)
    {
        var c = new double[FeatureCount(d)];
        double inv = 1.0 / d;
        int at = 0;
        c[at++] = 1;
        for (int i = 0; i < d; i++) c[at++] = 3 * inv;
        for (int i = 0; i < d; i++)
            for (int j = i; j < d; j++)
                c[at++] = 3 * (i == j ? 1 : 2) * inv * inv;
        for (int i = 0; i < d; i++)
            for (int j = i; j < d; j++)
                for (int k = j; k < d; k++)
                {
                    // 3!/α!: 1 when i = j = k, 3 when two indices agree, 6 when all differ.
                    int multinomial = i == j && j == k ? 1 : i == j || j == k ? 3 : 6;
                    c[at++] = multinomial * inv * inv * inv;
                }
        return c;
    }
}
