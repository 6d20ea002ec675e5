using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Projects rows of d features onto K fixed unit directions after standardising each feature by the reference's
/// mean and standard deviation: p_k = Σ_j u_kj·(x_j − m_j)/s_j. The standardisation is folded into the coefficients
/// (a_kj = u_kj/s_j, p_k = Σ_j a_kj·x_j − Σ_j a_kj·m_j), so a row costs K·d multiply-adds; the reference and the sample
/// are projected by the same code with the same numbers, so they agree to the bit.
/// </summary>
internal sealed class SlicedProjection
{
    private readonly double[] _coefficients; // [k·d + j]
    private readonly double[] _offsets;      // Σ_j a_kj·m_j
    private readonly double[] _transposed;   // [j·K + k]: a_kj, the directions side by side for the row-major projection
    private readonly double[] _negatedOffsets; // −Σ_j a_kj·m_j, where every projected value starts
    private readonly bool _anyZero;          // a zero coefficient is skipped, which the vector lanes do not do

    /// <param name="directions">K unit directions, row-major [k·d + j] (see <see cref="SlicedDirections.Draw"/>).</param>
    /// <param name="means">The reference's mean of each feature.</param>
    /// <param name="standardDeviations">The reference's standard deviation of each feature; each must be positive and finite.</param>
    public SlicedProjection(double[] directions, IReadOnlyList<double> means, IReadOnlyList<double> standardDeviations)
    {
        Dimensions = means.Count;
        if (Dimensions == 0 || standardDeviations.Count != Dimensions || directions.Length == 0 || directions.Length % Dimensions != 0)
            throw new ArgumentException($"{directions.Length} direction components do not fit {means.Count} means and {standardDeviations.Count} standard deviations.");
        for (var j = 0; j < Dimensions; j++)
        {
            if (!double.IsFinite(means[j]))
                throw new ArgumentException($"The mean of feature {j} is {means[j]}; standardising needs a finite mean.", nameof(means));
            if (!(standardDeviations[j] > 0) || !double.IsFinite(standardDeviations[j]))
                throw new ArgumentException($"The standard deviation of feature {j} is {standardDeviations[j]}; standardising needs a positive, finite one.", nameof(standardDeviations));
        }
        Count = directions.Length / Dimensions;
        Directions = (double[])directions.Clone();
        _coefficients = new double[directions.Length];
        _offsets = new double[Count];
        for (var k = 0; k < Count; k++)
        {
            var offset = 0.0;
            for (var j = 0; j < Dimensions; j++)
            {
                var a = directions[k * Dimensions + j] / standardDeviations[j];
                _coefficients[k * Dimensions + j] = a;
                offset += a * means[j];
            }
            _offsets[k] = offset;
        }
        _transposed = new double[directions.Length];
        for (var k = 0; k < Count; k++)
            for (var j = 0; j < Dimensions; j++)
                _transposed[j * Count + k] = _coefficients[k * Dimensions + j];
        _negatedOffsets = _offsets.Select(o => -o).ToArray();
        _anyZero = _coefficients.Any(a => a == 0);
    }

    /// <summary>The number of features d.</summary>
    public int Dimensions { get; }

    /// <summary>The number of directions K.</summary>
    public int Count { get; }

    /// <summary>The unit directions, row-major [k·d + j].</summary>
    public double[] Directions { get; }

    /// <summary>
    /// Projects <paramref name="rows"/> rows held column by column from row <paramref name="start"/> on
    /// (<paramref name="columns"/>[j][start + r]) into <paramref name="projected"/>[r·<paramref name="stride"/> + k]
    /// (stride ≥ K), row by row: the same numbers as
    /// <see cref="ProjectRow"/>, bit for bit (each is −offset, then + a_kj·x_j for j = 0 … d − 1, every product and sum
    /// rounded, no fused multiply-add), with a row's directions side by side in vector lanes and up to four vectors of
    /// partial sums kept in registers while the row's features are read, so each product is one multiply and one add and
    /// nothing is stored between features.
    /// </summary>
    public void ProjectRows(double[][] columns, int start, int rows, Span<double> projected, int stride)
    {
        var count = Count;
        var d = Dimensions;
        if (stride < count || projected.Length < (rows - 1) * stride + count) throw new ArgumentException("The output is too short.", nameof(projected));
        if (_anyZero)
        {
            for (var r = 0; r < rows; r++)
                for (var k = 0; k < count; k++)
                {
                    var p = -_offsets[k];
                    for (var j = 0; j < d; j++)
                    {
                        var a = _coefficients[k * d + j];
                        if (a != 0) p += a * columns[j][start + r];
                    }
                    projected[r * stride + k] = p;
                }
            return;
        }
        ref var a0 = ref MemoryMarshal.GetArrayDataReference(_transposed);
        ref var m0 = ref MemoryMarshal.GetArrayDataReference(_negatedOffsets);
        ref var out0 = ref MemoryMarshal.GetReference(projected);
        for (var r = 0; r < rows; r++)
        {
            ref var output = ref Unsafe.Add(ref out0, r * stride);
            var k = 0;
            if (Vector512.IsHardwareAccelerated)
            {
                const int lanes = 8;
                for (; k + 4 * lanes <= count; k += 4 * lanes)
                {
                    var s0 = Vector512.LoadUnsafe(ref m0, (nuint)k);
                    var s1 = Vector512.LoadUnsafe(ref m0, (nuint)(k + lanes));
                    var s2 = Vector512.LoadUnsafe(ref m0, (nuint)(k + 2 * lanes));
                    var s3 = Vector512.LoadUnsafe(ref m0, (nuint)(k + 3 * lanes));
                    for (var j = 0; j < d; j++)
                    {
                        var x = Vector512.Create(columns[j][start + r]);
                        var at = (nuint)(j * count + k);
                        s0 += Vector512.LoadUnsafe(ref a0, at) * x;
                        s1 += Vector512.LoadUnsafe(ref a0, at + lanes) * x;
                        s2 += Vector512.LoadUnsafe(ref a0, at + 2 * lanes) * x;
                        s3 += Vector512.LoadUnsafe(ref a0, at + 3 * lanes) * x;
                    }
                    s0.StoreUnsafe(ref output, (nuint)k);
                    s1.StoreUnsafe(ref output, (nuint)(k + lanes));
                    s2.StoreUnsafe(ref output, (nuint)(k + 2 * lanes));
                    s3.StoreUnsafe(ref output, (nuint)(k + 3 * lanes));
                }
                for (; k + lanes <= count; k += lanes)
                {
                    var s0 = Vector512.LoadUnsafe(ref m0, (nuint)k);
                    for (var j = 0; j < d; j++)
                        s0 += Vector512.LoadUnsafe(ref a0, (nuint)(j * count + k)) * Vector512.Create(columns[j][start + r]);
                    s0.StoreUnsafe(ref output, (nuint)k);
                }
            }
            if (Vector256.IsHardwareAccelerated)
            {
                const int lanes = 4;
                for (; k + 4 * lanes <= count; k += 4 * lanes)
                {
                    var s0 = Vector256.LoadUnsafe(ref m0, (nuint)k);
                    var s1 = Vector256.LoadUnsafe(ref m0, (nuint)(k + lanes));
                    var s2 = Vector256.LoadUnsafe(ref m0, (nuint)(k + 2 * lanes));
                    var s3 = Vector256.LoadUnsafe(ref m0, (nuint)(k + 3 * lanes));
                    for (var j = 0; j < d; j++)
                    {
                        var x = Vector256.Create(columns[j][start + r]);
                        var at = (nuint)(j * count + k);
                        s0 += Vector256.LoadUnsafe(ref a0, at) * x;
                        s1 += Vector256.LoadUnsafe(ref a0, at + lanes) * x;
                        s2 += Vector256.LoadUnsafe(ref a0, at + 2 * lanes) * x;
                        s3 += Vector256.LoadUnsafe(ref a0, at + 3 * lanes) * x;
                    }
                    s0.StoreUnsafe(ref output, (nuint)k);
                    s1.StoreUnsafe(ref output, (nuint)(k + lanes));
                    s2.StoreUnsafe(ref output, (nuint)(k + 2 * lanes));
                    s3.StoreUnsafe(ref output, (nuint)(k + 3 * lanes));
                }
                for (; k + lanes <= count; k += lanes)
                {
                    var s0 = Vector256.LoadUnsafe(ref m0, (nuint)k);
                    for (var j = 0; j < d; j++)
                        s0 += Vector256.LoadUnsafe(ref a0, (nuint)(j * count + k)) * Vector256.Create(columns[j][start + r]);
                    s0.StoreUnsafe(ref output, (nuint)k);
                }
            }
            for (; k < count; k++)
            {
                var p = _negatedOffsets[k];
                for (var j = 0; j < d; j++) p += _transposed[j * count + k] * columns[j][start + r];
                Unsafe.Add(ref output, k) = p;
            }
        }
    }

    /// <summary>The projection of one row onto direction k.</summary>
    public double ProjectRow(ReadOnlySpan<double> row, int k)
    {
        var p = -_offsets[k];
        for (var j = 0; j < Dimensions; j++)
        {
            var a = _coefficients[k * Dimensions + j];
            if (a != 0) p += a * row[j];
        }
        return p;
    }
}
