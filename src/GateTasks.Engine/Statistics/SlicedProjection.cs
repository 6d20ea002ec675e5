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
    }

    /// <summary>The number of features d.</summary>
    public int Dimensions { get; }

    /// <summary>The number of directions K.</summary>
    public int Count { get; }

    /// <summary>The unit directions, row-major [k·d + j].</summary>
    public double[] Directions { get; }

    /// <summary>
    /// Projects <paramref name="rows"/> rows held column by column (<paramref name="columns"/>[j][r], r &lt; rows) into
    /// <paramref name="projected"/>[k·stride + r]. Columns are read whole per direction so the inner loop is a
    /// vectorisable a·x + y over rows.
    /// </summary>
    public void Project(double[][] columns, int rows, double[] projected, int stride)
    {
        for (var k = 0; k < Count; k++)
        {
            var output = projected.AsSpan(k * stride, rows);
            output.Fill(-_offsets[k]);
            for (var j = 0; j < Dimensions; j++)
            {
                var a = _coefficients[k * Dimensions + j];
                if (a == 0) continue;
                MultiplyAdd(a, columns[j].AsSpan(0, rows), output);
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

    private static void MultiplyAdd(double a, ReadOnlySpan<double> x, Span<double> y)
    {
        // Each element is y + a·x rounded twice (no fused multiply-add), in scalar and vector lanes alike, so the
        // result does not depend on the vector width.
        var i = 0;
        if (System.Numerics.Vector.IsHardwareAccelerated && x.Length >= System.Numerics.Vector<double>.Count)
        {
            var va = new System.Numerics.Vector<double>(a);
            var xs = System.Runtime.InteropServices.MemoryMarshal.Cast<double, System.Numerics.Vector<double>>(x);
            var ys = System.Runtime.InteropServices.MemoryMarshal.Cast<double, System.Numerics.Vector<double>>(y);
            for (var v = 0; v < xs.Length; v++) ys[v] += va * xs[v];
            i = xs.Length * System.Numerics.Vector<double>.Count;
        }
        for (; i < x.Length; i++) y[i] += a * x[i];
    }
}
