namespace GateTasks.Engine.Histograms;

/// <summary>
/// The cumulative weight of cells laid out in value order — the underflow, the bins of <c>edges</c>, the overflow — at
/// a value x, with each bin's weight spread uniformly over the bin and the underflow sitting at the lower edge: 0 below
/// the axis, linear within a bin, and everything but the overflow at or above the last edge. Not normalised.
/// </summary>
internal static class CellCdf
{
    public static double At(ReadOnlySpan<double> edges, ReadOnlySpan<double> cells, double x)
    {
        if (x < edges[0]) return 0;
        var cumulative = cells[0];
        for (var b = 0; b < edges.Length - 1; b++)
        {
            if (x < edges[b + 1]) return cumulative + cells[b + 1] * (x - edges[b]) / (edges[b + 1] - edges[b]);
            cumulative += cells[b + 1];
        }
        return cumulative;
    }
}
