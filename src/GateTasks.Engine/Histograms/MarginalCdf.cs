namespace GateTasks.Engine.Histograms;

/// <summary>
/// The cumulative distribution of a histogram, linear within each bin (under- and overflow as point masses at the
/// axis ends): maps a value to its probability rank, as ranks are needed for Spearman's coefficient.
/// </summary>
internal sealed class MarginalCdf
{
    private readonly double[] _edges;
    private readonly double[] _below; // CDF at each edge
    private readonly double _under;

    public MarginalCdf(Histogram h)
    {
        Axis = h.Axis;
        _edges = h.Axis.Edges.ToArray();
        var w = h.SumW;
        var total = h.TotalSumW;
        _below = new double[_edges.Length];
        var c = w[0];
        _under = total > 0 ? w[0] / total : 0;
        for (var i = 0; i < _edges.Length; i++)
        {
            _below[i] = total > 0 ? c / total : 0;
            if (i < _edges.Length - 1) c += w[i + 1];
        }
    }

    /// <summary>The histogram's axis, whose storage cells <see cref="Rank"/> takes.</summary>
    public Axis Axis { get; }

    public double Evaluate(double x)
    {
        if (double.IsNaN(x)) return double.NaN;
        if (x < _edges[0]) return _under / 2;
        if (x >= _edges[^1]) return (_below[^1] + 1) / 2;
        var i = Array.BinarySearch(_edges, x);
        if (i >= 0) return _below[i];
        var b = ~i - 1;
        var f = (x - _edges[b]) / (_edges[b + 1] - _edges[b]);
        return _below[b] + f * (_below[b + 1] - _below[b]);
    }

    /// <summary>
    /// <see cref="Evaluate"/> for a value not NaN whose storage cell on <see cref="Axis"/> is known (0 the underflow,
    /// bins from 1, the last the overflow): the same number to the bit, without a search. The axis puts a value at an
    /// edge into the bin above, as the search does, and a value at a lower edge interpolates to that edge's CDF exactly.
    /// </summary>
    public double Rank(double x, int cell) => RankOf(x, cell, _edges, _below, _under);

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    private static double RankOf(double x, int cell, double[] edges, double[] below, double under)
    {
        if (cell == 0) return under / 2;
        if (cell == edges.Length) return (below[^1] + 1) / 2;
        var b = cell - 1;
        var f = (x - edges[b]) / (edges[b + 1] - edges[b]);
        return below[b] + f * (below[b + 1] - below[b]);
    }

    /// <summary>
    /// <see cref="Rank"/> of a batch: each value's rank from its storage cell, NaN where the cell is
    /// <paramref name="nanCell"/>; whether any was. Compiled optimised from the first call, as it runs for every value.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public bool Ranks(ReadOnlySpan<double> values, ReadOnlySpan<int> cells, Span<double> ranks, int nanCell)
    {
        var nan = false;
        var (edges, below, under) = (_edges, _below, _under);
        for (var r = 0; r < values.Length; r++)
        {
            if (cells[r] == nanCell)
            {
                nan = true;
                ranks[r] = double.NaN;
            }
            else ranks[r] = RankOf(values[r], cells[r], edges, below, under);
        }
        return nan;
    }
}
