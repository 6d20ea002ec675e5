using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Wasserstein-1 distance between reference and sample, divided by the reference's unbinned standard deviation so
/// one tolerance reads the same for every feature. Integrated on the reference's fine equal-probability grid with the
/// tails' exact first moments (<see cref="Wasserstein.FineGrid"/>), so a long tail is not smeared over a coarse bin.
/// The replicas of plan and calibration draw that grid too (Calibration/FineGridLaw, inner cells merged). Only where
/// no fine grid is at hand (a comparison built without one) on the coarse bins, flows counted at the axis ends.
/// Bias-corrected and judged against its own noise at the tolerance (<see cref="DistanceDecision"/>); errors by
/// <see cref="HistogramBootstrap"/>.
/// </summary>
internal static class WassersteinCheck
{
    public static Measurement Evaluate(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        var sigma = c.Reference.Summary.StandardDeviation;
        if (!(sigma > 0))
            return Measurement.Impossible("the reference's standard deviation is zero, so W1/σ is undefined; use ratio-max or ks-max for this feature", []);
        if (c.Reference.FineGrid is { } rg && c.SampleFineGrid is { } sg)
            return OnFineGrid(c, rg, sg, sigma, spec, decision);
        var edges = c.Reference.Histogram.Axis.Edges.ToArray();
        double Distance(double[] a, double[] b) => Wasserstein.Histograms(edges, Folded(a), Folded(b)) / sigma;
        return Decide(c, Cells.Of(c.Reference.Histogram), Cells.Of(c.Surrogate), Distance, sigma, "coarse bins", spec, decision);
    }

    private static Measurement OnFineGrid(FeatureComparison c, FineGridCells reference, FineGridCells sample, double sigma, ToleranceCheck spec, DecisionSettings decision)
    {
        if (reference.Edges.Length != sample.Edges.Length || !reference.Edges.AsSpan().SequenceEqual(sample.Edges))
            throw new InvalidOperationException("The sample's fine grid is not the reference's.");
        if (!(reference.TotalSumW > 0) || !(sample.TotalSumW > 0))
            return Measurement.Impossible("a sample's total weight on the fine grid is not positive, so its CDF is undefined", []);
        var edges = reference.Edges;
        // Packed as [tail moment below, cells (flows included), tail moment above], so the bootstrap redraws all of it.
        double Distance(double[] a, double[] b) =>
            Wasserstein.FineGrid(edges, a.AsSpan(1, a.Length - 2), a[0], a[^1], b.AsSpan(1, b.Length - 2), b[0], b[^1]) / sigma;
        (double, double, double) Three(double[] a0, double[] b0, double[] a1, double[] b1, double[] a2, double[] b2)
        {
            var (x, y, z) = Wasserstein.FineGridThree(edges, a0, b0, a1, b1, a2, b2);
            return (x / sigma, y / sigma, z / sigma);
        }
        (double, double, double, double) Four(double[] a0, double[] b0, double[] a1, double[] b1, double[] a2, double[] b2, double[] a3, double[] b3)
        {
            var (w, x, y, z) = Wasserstein.FineGridFour(edges, a0, b0, a1, b1, a2, b2, a3, b3);
            return (w / sigma, x / sigma, y / sigma, z / sigma);
        }
        return Decide(c, Packed(reference), Packed(sample), Distance, sigma, $"fine grid of {edges.Length - 1} cells", spec, decision, Three, Four);
    }

    private static CellContents Packed(FineGridCells g) =>
        new([g.BelowMoment, .. g.SumW, g.AboveMoment], [g.BelowMoment2, .. g.SumW2, g.AboveMoment2]);

    private static Measurement Decide(FeatureComparison c, CellContents reference, CellContents surrogate, Func<double[], double[], double> distance,
        double sigma, string grid, ToleranceCheck spec, DecisionSettings decision, ThreeDistances? three = null, FourDistances? four = null)
    {
        var value = distance(reference.SumW, surrogate.SumW);
        var seed = HistogramBootstrap.Seed(c.Spec.Name, spec.Key);
        var (se, bias) = HistogramBootstrap.StandardErrorsAndBias(reference, surrogate, distance, value, seed, three);
        var boundary = HistogramBootstrap.BoundaryReplicas(reference, surrogate, distance, value, spec.Tolerance, seed, four);
        return DistanceDecision.Measure(value, bias, se, boundary, spec, decision, c.Surrogate.Entries,
            $"W1/σ_ref {InvariantNumber.Short(Math.Max(0, value - bias))}",
            [new("w1", InvariantNumber.Exact(value * sigma)), new("reference_std", InvariantNumber.Exact(sigma)), new("w1_grid", grid)]);
    }

    /// <summary>Regular bins with the underflow added to the first and the overflow to the last.</summary>
    private static double[] Folded(double[] cells)
    {
        var bins = cells[1..^1];
        bins[0] += cells[0];
        bins[^1] += cells[^1];
        return bins;
    }
}
