using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Histograms;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// The unbinned summary (mean, standard deviation, kurtosis) of a replica, as a check streams it from events, drawn
/// from the reference's own unbinned summary rather than computed at bin centres: a long-tailed feature's outermost
/// bin can span decades, so its centre puts σ an order of magnitude off. The replica's mean is normal about the true
/// mean with variance σ²/n and its standard deviation normal about σ with relative variance (κ − 1)/(4n) (the
/// large-sample laws of the sample moments, Kendall &amp; Stuart, vol. 1, ch. 10), both at the replica's size n.
/// A drift maps the true moments exactly where it is a map of values (a scale or width change); otherwise (a tail
/// deficit, a shifted top category) the binned moments' change is carried over in units of the binned σ.
/// </summary>
internal static class ReplicaSummary
{
    /// <summary>The true unbinned moments of the surrogate under <paramref name="drift"/>: (mean, σ).</summary>
    public static (double Mean, double StandardDeviation) Truth(FeatureSummary reference, Axis axis, double[] truth, double[] drifted, Drift drift)
    {
        var (mu, sigma) = (reference.Mean, reference.StandardDeviation);
        switch (drift.Kind)
        {
            case DriftKind.None:
                return (mu, sigma);
            case DriftKind.Scale:
                return (mu * (1 + drift.Size), sigma * (1 + drift.Size));
            case DriftKind.Width:
                return (mu, sigma * (1 + drift.Size));
            default:
                var (mt, st) = Binned(axis, truth);
                var (md, sd) = Binned(axis, drifted);
                if (!(st > 0)) return (mu, sigma);
                return (mu + (md - mt) / st * sigma, sigma * sd / st);
        }
    }

    /// <summary>A replica's summary of <paramref name="events"/> unit-weight events about the given true moments.</summary>
    public static FeatureSummary Draw(FeatureSummary reference, (double Mean, double StandardDeviation) truth, long events, Random rng)
    {
        if (events <= 0) return Expected(reference, truth, 0);
        var kappa = Kurtosis(reference);
        var n = (double)events;
        var mean = truth.Mean + truth.StandardDeviation / Math.Sqrt(n) * Normal.Sample(rng, 0, 1);
        var sd = truth.StandardDeviation * Math.Max(0, 1 + Math.Sqrt((kappa - 1) / (4 * n)) * Normal.Sample(rng, 0, 1));
        return new FeatureSummary(events, n, n, mean, sd, reference.Min, reference.Max, 0, reference.Kurtosis);
    }

    /// <summary>The summary without noise: the true moments at a size of <paramref name="events"/>.</summary>
    public static FeatureSummary Expected(FeatureSummary reference, (double Mean, double StandardDeviation) truth, double events) =>
        new((long)Math.Round(events), events, events, truth.Mean, truth.StandardDeviation, reference.Min, reference.Max, 0, reference.Kurtosis);

    /// <summary>The reference's unbinned kurtosis; 3 (a normal law's) where the reference stored none.</summary>
    private static double Kurtosis(FeatureSummary reference) => double.IsFinite(reference.Kurtosis) && reference.Kurtosis >= 1 ? reference.Kurtosis : 3;

    /// <summary>Mean and σ of cell probabilities at bin centres (the flows at the axis ends).</summary>
    private static (double Mean, double StandardDeviation) Binned(Axis axis, double[] p)
    {
        double Position(int c) => c == 0 ? axis.Edges[0] : c == axis.Count + 1 ? axis.Edges[^1] : axis.Centre(c - 1);
        double w = 0, m1 = 0;
        for (var c = 0; c < p.Length && c <= axis.Count + 1; c++) { w += p[c]; m1 += p[c] * Position(c); }
        if (!(w > 0)) return (double.NaN, double.NaN);
        var mean = m1 / w;
        double m2 = 0;
        for (var c = 0; c < p.Length && c <= axis.Count + 1; c++) { var d = Position(c) - mean; m2 += p[c] * d * d; }
        return (mean, Math.Sqrt(m2 / w));
    }
}
