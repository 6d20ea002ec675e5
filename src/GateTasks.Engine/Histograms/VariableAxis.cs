namespace GateTasks.Engine.Histograms;

/// <summary>Bins of arbitrary widths given by their edges; the bin index is found by binary search.</summary>
internal sealed class VariableAxis : Axis
{
    private readonly double[] _edges;

    /// <summary>Creates an axis from strictly increasing, finite edges (at least two).</summary>
    public VariableAxis(IReadOnlyList<double> edges)
    {
        if (edges.Count < 2) throw new ArgumentException("An axis needs at least two edges.", nameof(edges));
        _edges = edges.ToArray();
        for (var i = 0; i < _edges.Length; i++)
        {
            if (!double.IsFinite(_edges[i])) throw new ArgumentException($"Edge {i} is not finite ({_edges[i]}).", nameof(edges));
            if (i > 0 && !(_edges[i] > _edges[i - 1]))
                throw new ArgumentException($"Edges must increase strictly; edge {i} ({_edges[i]}) follows {_edges[i - 1]}.", nameof(edges));
        }
    }

    /// <inheritdoc />
    public override int Count => _edges.Length - 1;

    /// <inheritdoc />
    public override ReadOnlySpan<double> Edges => _edges;

    /// <inheritdoc />
    public override int Index(double value)
    {
        if (value < _edges[0]) return Underflow;
        if (value >= _edges[^1]) return Count;
        // Index of the first edge greater than value, minus one, is the bin holding value.
        var i = Array.BinarySearch(_edges, value);
        return i >= 0 ? i : ~i - 1;
    }
}
