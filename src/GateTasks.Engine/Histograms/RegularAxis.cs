namespace GateTasks.Engine.Histograms;

/// <summary>Equal-width bins between two limits; the bin index is computed, not searched.</summary>
internal sealed class RegularAxis : Axis
{
    private readonly double[] _edges;
    private readonly double _lower;
    private readonly double _upper;
    private readonly double _scale;

    /// <summary>Creates <paramref name="count"/> equal bins over [lower, upper).</summary>
    public RegularAxis(int count, double lower, double upper)
    {
        if (count < 1) throw new ArgumentOutOfRangeException(nameof(count), "An axis needs at least one bin.");
        if (!double.IsFinite(lower) || !double.IsFinite(upper) || !(upper > lower))
            throw new ArgumentException($"Axis limits must be finite and increasing, got [{lower}, {upper}).");
        _lower = lower;
        _upper = upper;
        _scale = count / (upper - lower);
        _edges = new double[count + 1];
        for (var i = 0; i <= count; i++) _edges[i] = lower + (upper - lower) * i / count;
        _edges[count] = upper;
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
    public override void Cells(ReadOnlySpan<double> values, Span<int> cells, int nanCell)
    {
        for (var i = 0; i < values.Length; i++)
        {
            var v = values[i];
            cells[i] = double.IsNaN(v) ? nanCell : Index(v) + 1;
        }
    }
}
