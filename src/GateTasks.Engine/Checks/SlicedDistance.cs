using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Sliced distances between two samples' projected histograms (<see cref="SlicedHistograms"/> on the same grids):
/// per projection the Kolmogorov–Smirnov distance and the Wasserstein-1 distance of the projected laws, and their
/// worst and mean over the K projections. The sliced Wasserstein distance is the mean over directions of the
/// one-dimensional W1 of the projections (Rabin, Peyré, Delon &amp; Bernot 2011, "Wasserstein barycenter and its
/// application to texture mixing", SSVM; Bonneel, Rabin, Peyré &amp; Pfister 2015, "Sliced and Radon Wasserstein
/// barycenters of measures", J. Math. Imaging Vis. 51:22), here over K fixed random directions; the largest over the
/// directions is the max-sliced distance (Deshpande, Hu, Sun, Pyrros, Siddiqui, Koyejo, Zhao, Forsyth &amp; Schwing
/// 2019, "Max-sliced Wasserstein distance and its use for GANs", CVPR), restricted to the same K directions, and the
/// same two summaries of the projected KS distance give a sliced KS (both sliced forms as fidelity measures of
/// generated samples: Grossi, Letizia &amp; Torre 2024, "Refereeing the referees", arXiv:2409.16336). W1 is integrated on the fine grid with the
/// tails' exact first moments (<see cref="Wasserstein.FineGrid"/>) and divided by the reference's projected standard
/// deviation, so a tolerance reads in units of the reference's spread along each direction; KS is taken at the grid's
/// edges (<see cref="KolmogorovSmirnov.BinnedDistance"/>), a lower bound of the unbinned distance by at most the
/// largest weight of one cell.
/// </summary>
internal static class SlicedDistance
{
    /// <summary>One projection's distance between packed vectors <paramref name="a"/> and <paramref name="b"/> (see <see cref="SlicedHistograms.Cells"/>).</summary>
    public static double Projection(SlicedMeasure measure, double[] edges, ReadOnlySpan<double> a, ReadOnlySpan<double> b, double sigma)
    {
        var (ks, w1) = Both(edges, a, b, sigma);
        return measure switch
        {
            SlicedMeasure.KolmogorovSmirnov => ks,
            SlicedMeasure.Wasserstein => w1,
            _ => throw new ArgumentOutOfRangeException(nameof(measure)),
        };
    }

    /// <summary>
    /// Both distances of one projection in one pass over its cells: KS, the largest |F − G| at the cells' upper edges
    /// (as <see cref="KolmogorovSmirnov.BinnedDistance"/>), and W1/σ, ∫|F − G| on the grid with the tails' first
    /// moments (as <see cref="Wasserstein.FineGrid"/>) — the same sums, each CDF taken as the running sum times the
    /// reciprocal of its total, so that the bootstrap's tens of thousands of evaluations cost no divisions.
    /// (NaN, NaN) when either total over the cells is not positive.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    public static (double Ks, double W1) Both(double[] edges, ReadOnlySpan<double> a, ReadOnlySpan<double> b, double sigma)
    {
        var cellsA = a[1..^1];
        var cellsB = b[1..^1];
        if (cellsA.Length != edges.Length + 1 || cellsB.Length != cellsA.Length)
            throw new ArgumentException($"{edges.Length} edges need {edges.Length + 1} cells (flows included), got {cellsA.Length} and {cellsB.Length}.", nameof(edges));
        double ta = 0, tb = 0;
        for (var i = 0; i < cellsA.Length; i++)
        {
            ta += cellsA[i];
            tb += cellsB[i];
        }
        if (!(ta > 0) || !(tb > 0) || !double.IsFinite(ta) || !double.IsFinite(tb)) return (double.NaN, double.NaN);
        double ia = 1 / ta, ib = 1 / tb;
        // After cell 0 (the underflow): the CDF difference at the lowest edge.
        double ca = cellsA[0], cb = cellsB[0];
        var previous = ca * ia - cb * ib;
        var ks = Math.Abs(previous);
        var area = Math.Abs(a[0] * ia - b[0] * ib);
        for (var i = 1; i < cellsA.Length; i++)
        {
            ca += cellsA[i];
            cb += cellsB[i];
            var next = ca * ia - cb * ib;
            ks = Math.Max(ks, Math.Abs(next));
            if (i < edges.Length) area += (edges[i] - edges[i - 1]) * Wasserstein.LinearAbsMean(previous, next);
            previous = next;
        }
        area += Math.Abs(a[^1] * ia - b[^1] * ib);
        return (ks, area / sigma);
    }

    /// <summary>The distance on each projection, W1 in units of the reference's projected σ.</summary>
    public static double[] PerProjection(SlicedMeasure measure, SlicedHistograms reference, SlicedHistograms sample)
    {
        Require(reference, sample);
        var result = new double[reference.Projections];
        for (var k = 0; k < result.Length; k++)
            result[k] = Projection(measure, reference.Edges[k], reference.Cells[k], sample.Cells[k], reference.StandardDeviation[k]);
        return result;
    }

    /// <summary>The worst or the mean of per-projection distances.</summary>
    public static double Summarise(IReadOnlyList<double> perProjection, SlicedSummary summary) =>
        summary switch
        {
            SlicedSummary.Worst => perProjection.Max(),
            SlicedSummary.Mean => perProjection.Average(),
            _ => throw new ArgumentOutOfRangeException(nameof(summary)),
        };

    /// <summary>Refuses histograms that are not on the same grids, or whose reference lacks a positive spread or total.</summary>
    public static void Require(SlicedHistograms reference, SlicedHistograms sample)
    {
        if (reference.Projections != sample.Projections)
            throw new ArgumentException($"The reference has {reference.Projections} projections, the sample {sample.Projections}.");
        for (var k = 0; k < reference.Projections; k++)
        {
            if (!reference.Edges[k].AsSpan().SequenceEqual(sample.Edges[k]))
                throw new ArgumentException($"Projection {k}'s grid differs between the reference and the sample.");
            if (!(reference.StandardDeviation[k] > 0))
                throw new ArgumentException($"The reference's projection {k} has standard deviation {reference.StandardDeviation[k]}, so W1/σ is undefined.");
            if (!(reference.TotalSumW(k) > 0) || !(sample.TotalSumW(k) > 0))
                throw new ArgumentException($"A total weight on projection {k} is not positive, so its CDF is undefined.");
        }
    }
}
