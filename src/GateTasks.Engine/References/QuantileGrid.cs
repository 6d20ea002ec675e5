using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.References;

/// <summary>
/// Quantiles of a streamed sample from a fine regular histogram over [min, max] (2^16 cells), so memory does
/// not grow with the number of events. A quantile is interpolated linearly inside its cell; its error is
/// at most one cell width, (max − min)/65 536. Equal-probability edges are snapped to cell edges, which lets
/// the final histogram be summed exactly from the fine one.
/// </summary>
internal sealed class QuantileGrid
{
    public const int Cells = 1 << 16;

    public QuantileGrid(double min, double max)
    {
        var (lo, hi) = Span(min, max);
        Fine = new Histogram(new RegularAxis(Cells, lo, hi));
    }

    /// <summary>The fine histogram; fill it with every non-NaN value.</summary>
    public Histogram Fine { get; }

    /// <summary>Axis limits that hold every value in [min, max] inside the regular cells.</summary>
    public static (double Lower, double Upper) Span(double min, double max)
    {
        if (!(max > min)) return (min - 0.5, min + 0.5); // a constant feature still gets a usable axis
        var width = max - min;
        var upper = max + width * 1e-9;
        if (!(upper > max)) upper = Math.BitIncrement(max);
        return (min, upper);
    }

    /// <summary>The value below which a fraction <paramref name="p"/> of the weight lies.</summary>
    public double Quantile(double p)
    {
        var w = Fine.SumW;
        var total = Fine.TotalSumW;
        var target = p * total;
        var edges = Fine.Axis.Edges;
        var cumulative = 0.0;
        for (var c = 1; c <= Cells; c++)
        {
            var next = cumulative + w[c];
            if (next >= target && w[c] > 0)
            {
                var fraction = Math.Clamp((target - cumulative) / w[c], 0, 1);
                return edges[c - 1] + fraction * (edges[c] - edges[c - 1]);
            }
            cumulative = next;
        }
        return edges[^1];
    }

    /// <summary>
    /// The edges of a Wasserstein check's fine grid: the sample's lowest value, its quantiles at probabilities
    /// j/<paramref name="bins"/> (j = 1 … bins − 1) and, further into each tail, at 2^−k/bins and 1 − 2^−k/bins
    /// (k = 1 … <paramref name="tailLevels"/>), and the axis's upper end, coinciding edges merged. A quantile is
    /// interpolated inside its cell (as <see cref="Quantile"/> does), not snapped to a cell edge: on a long-tailed
    /// feature one of the 2^16 regular cells can hold many of the grid's quantiles near the mode. The outermost edges
    /// hold the whole reference, so beyond them only the other sample has weight and its tail moments integrate
    /// |F − G| there exactly.
    /// </summary>
    public double[] FineEdges(int bins, int tailLevels)
    {
        var probabilities = new List<double>();
        for (var k = tailLevels; k >= 1; k--) probabilities.Add(Math.Pow(2, -k) / bins);
        for (var j = 1; j < bins; j++) probabilities.Add((double)j / bins);
        for (var k = 1; k <= tailLevels; k++) probabilities.Add(1 - Math.Pow(2, -k) / bins);
        var w = Fine.SumW;
        var total = Fine.TotalSumW;
        var edges = Fine.Axis.Edges;
        var result = new List<double> { edges[0] };
        var cumulative = 0.0;
        var c = 1;
        foreach (var p in probabilities)
        {
            var target = p * total;
            while (c <= Cells && !(cumulative + w[c] >= target && w[c] > 0))
            {
                cumulative += w[c];
                c++;
            }
            if (c > Cells) break;
            var fraction = Math.Clamp((target - cumulative) / w[c], 0, 1);
            var value = edges[c - 1] + fraction * (edges[c] - edges[c - 1]);
            if (value > result[^1] && value < edges[^1]) result.Add(value);
        }
        result.Add(edges[^1]);
        return result.ToArray();
    }

    /// <summary>
    /// Edges of at most <paramref name="bins"/> bins of about equal weight, on cell edges. Where one value holds
    /// more than a bin's share (a spike), neighbouring edges coincide and are merged, so fewer bins result.
    /// </summary>
    public double[] EqualProbabilityEdges(int bins)
    {
        var w = Fine.SumW;
        var total = Fine.TotalSumW;
        var edges = Fine.Axis.Edges;
        var result = new List<double> { edges[0] };
        var cumulative = 0.0;
        var k = 1;
        for (var c = 1; c <= Cells && k < bins; c++)
        {
            cumulative += w[c];
            if (cumulative >= total * k / bins)
            {
                if (edges[c] > result[^1] && c < Cells) result.Add(edges[c]);
                while (k < bins && cumulative >= total * k / bins) k++;
            }
        }
        if (edges[^1] > result[^1]) result.Add(edges[^1]);
        return result.ToArray();
    }
}
