namespace GateTasks.Engine.Histograms;

/// <summary>
/// Maps a value to a bin. Bins are half-open, [lower, upper); values below the first edge go to the
/// underflow, values at or above the last edge to the overflow. The axis never grows.
/// NaN is not the axis's business: the histogram counts it on its own.
/// </summary>
internal abstract class Axis
{
    /// <summary>Index returned for a value below the first edge.</summary>
    public const int Underflow = -1;

    /// <summary>Number of regular bins (flows excluded).</summary>
    public abstract int Count { get; }

    /// <summary>The <see cref="Count"/> + 1 bin edges, increasing.</summary>
    public abstract ReadOnlySpan<double> Edges { get; }

    /// <summary>Overflow index, equal to <see cref="Count"/>.</summary>
    public int Overflow => Count;

    /// <summary>Regular bin index in [0, Count), or <see cref="Underflow"/>, or <see cref="Overflow"/>. Not for NaN.</summary>
    public abstract int Index(double value);

    /// <summary>
    /// For each value, its histogram storage cell (<see cref="Index"/> + 1: 0 the underflow, <see cref="Count"/> + 1
    /// the overflow), or <paramref name="nanCell"/> for NaN. One call per block of values spares the per-value
    /// virtual call in a histogram's fill loop.
    /// </summary>
    public virtual void Cells(ReadOnlySpan<double> values, Span<int> cells, int nanCell)
    {
        for (var i = 0; i < values.Length; i++)
            cells[i] = double.IsNaN(values[i]) ? nanCell : Index(values[i]) + 1;
    }

    /// <summary>
    /// <see cref="Cells(ReadOnlySpan{double}, Span{int}, int)"/> for values stored as float32: the cells of the same
    /// values as doubles (widening is exact).
    /// </summary>
    public virtual void Cells(ReadOnlySpan<float> values, Span<int> cells, int nanCell)
    {
        for (var i = 0; i < values.Length; i++)
            cells[i] = float.IsNaN(values[i]) ? nanCell : Index(values[i]) + 1;
    }

    /// <summary>
    /// The edges as float32 for <see cref="EdgeCountSearch"/> where it takes this axis (few enough edges, SIMD
    /// registers), else null.
    /// </summary>
    protected static float[]? CountingEdges(ReadOnlySpan<double> edges) =>
        edges.Length <= EdgeCountSearch.MaxEdges && EdgeCountSearch.IsSupported ? EdgeCountSearch.Float32Edges(edges) : null;

    /// <summary>Lower edge of regular bin <paramref name="bin"/>.</summary>
    public double Lower(int bin) => Edges[bin];

    /// <summary>Upper edge of regular bin <paramref name="bin"/>.</summary>
    public double Upper(int bin) => Edges[bin + 1];

    /// <summary>Centre of regular bin <paramref name="bin"/>.</summary>
    public double Centre(int bin) => 0.5 * (Edges[bin] + Edges[bin + 1]);

    /// <summary>True when both axes have exactly the same edges.</summary>
    public bool SameBinning(Axis other) => Edges.SequenceEqual(other.Edges);

    /// <summary>Builds the cheapest axis for the edges: regular when they are equally spaced to the last bit.</summary>
    public static Axis FromEdges(IReadOnlyList<double> edges)
    {
        var variable = new VariableAxis(edges);
        if (edges.Count >= 2)
        {
            var regular = new RegularAxis(edges.Count - 1, edges[0], edges[^1]);
            if (regular.SameBinning(variable)) return regular;
        }
        return variable;
    }
}
