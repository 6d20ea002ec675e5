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
}
