using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Checks;

/// <summary>
/// The normalised cumulative distribution of weight on a fine grid (<see cref="FineGridCells"/>), linear inside each
/// cell: its value at each edge, its quantiles by inversion, and a density at a quantile from a symmetric difference of
/// quantiles. The grid is the reference's equal-probability one (about 4 096 cells), so a quantile is read to a few
/// ten-thousandths in probability, far below any sample's own noise.
/// </summary>
internal sealed class FineGridCdf
{
    private readonly double[] _edges;
    private readonly double[] _atEdge; // F(edge_k): the weight below edge k (underflow and cells 1..k), over the total

    public FineGridCdf(FineGridCells grid)
    {
        _edges = grid.Edges;
        var total = grid.TotalSumW;
        _atEdge = new double[_edges.Length];
        var running = 0.0;
        for (var k = 0; k < _edges.Length; k++)
        {
            running += grid.SumW[k]; // cell k: the underflow for k = 0, else [edge_{k−1}, edge_k)
            _atEdge[k] = running / total;
        }
    }

    /// <summary>
    /// The p-quantile: the first edge where F reaches p, interpolated linearly from the edge before it. Weight beyond
    /// the grid's outermost edges is placed at them. With signed weights F need not be monotone; the first crossing is taken.
    /// </summary>
    public double Quantile(double p)
    {
        if (p <= _atEdge[0]) return _edges[0];
        for (var k = 1; k < _edges.Length; k++)
        {
            if (_atEdge[k] < p) continue;
            var below = _atEdge[k - 1];
            var step = _atEdge[k] - below;
            return step > 0 ? _edges[k - 1] + (p - below) / step * (_edges[k] - _edges[k - 1]) : _edges[k];
        }
        return _edges[^1];
    }

    /// <summary>
    /// The density at the p-quantile, 2h/(Q(p + h) − Q(p − h)) with h = min(0.01, p/2, (1 − p)/2): a central
    /// difference, whose error is of order h² times the density's curvature; NaN where the quantiles coincide.
    /// </summary>
    public double DensityAt(double p)
    {
        var h = Math.Min(0.01, Math.Min(p, 1 - p) / 2);
        var width = Quantile(p + h) - Quantile(p - h);
        return width > 0 ? 2 * h / width : double.NaN;
    }
}
