using System.Globalization;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Shifts of the quantiles that bound the core, and of the median, in units of the reference's standard
/// deviation: the effect is the largest |q_s(p) − q_r(p)|/σ_r. The sample's quantile is taken to first order,
/// q_s ≈ q_r − (F_s(q_r) − p)/f_r(q_r) (Bahadur 1966, Ann. Math. Statist. 37:577), from the sample's cumulative
/// distribution at the reference quantile — an edge of equal-probability bins, so read without interpolation — and the
/// reference density on the core's side of it; interpolating the sample's quantile inside an outermost bin, which runs
/// to the reference's extreme value, would instead magnify a small change of the tail fraction by that bin's width.
/// Each quantile has the asymptotic standard error √(p(1−p)/n)/f(q_p) (Serfling 1980, §2.3); as for the bin ratios,
/// a pass needs every quantile's bound below the tolerance, and the fail p-value is Bonferroni-corrected over the three.
/// The reference keeps its fine grid for this check and the sample gathers one, so both quantiles are read off it
/// directly and the density at q_r is local (<see cref="FineGridCdf"/>): a bin's average density on a falling tail
/// (0.64 of the true one at the 95% quantile of a log-normal with σ = 0.8 and 20 equal-probability bins) scaled the
/// shift and its error alike, so shifts read a third too small. The first-order reading above remains for a
/// comparison without fine grids (simulation replicas of a reference that keeps none).
/// </summary>
internal static class QuantileShiftCheck
{
    public static Measurement Evaluate(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        var sigma = c.Reference.Summary.StandardDeviation;
        if (!(sigma > 0)) return Measurement.Impossible("the reference's standard deviation is zero, so a quantile shift in its units is undefined", []);
        if (c.Reference.FineGrid is { } rg && c.SampleFineGrid is { } sg) return OnFineGrid(c, rg, sg, sigma, spec, decision);
        var r = c.Reference.Histogram;
        var s = c.Surrogate;
        var nRef = KishCount.Of(r.TotalSumW, r.TotalSumW2);
        var nSur = KishCount.Of(s.TotalSumW, s.TotalSumW2);
        var effect = new EffectIntersection(spec.Tolerance, decision, s.Entries);
        double[] probabilities = [c.Spec.Core.LowerQuantile, 0.5, c.Spec.Core.UpperQuantile];

        double worst = 0;
        var details = new List<KeyValuePair<string, string>>();
        foreach (var p in probabilities)
        {
            var (qr, _) = r.Quantile(p);
            var density = CoreSideDensity(r, qr, p);
            if (!(density > 0)) return Measurement.Impossible($"the reference histogram has no density at its {p} quantile", details);
            var qs = qr - (s.Cdf(qr) - p) / density;
            var shift = Math.Abs(qs - qr) / sigma;
            var unit = Math.Sqrt(p * (1 - p)) / density / sigma;
            var seRef = unit / Math.Sqrt(nRef);
            var seSur = unit / Math.Sqrt(nSur);
            worst = Math.Max(worst, shift);
            effect.Add(shift, seRef, seSur);
            var key = p.ToString("0.###", CultureInfo.InvariantCulture);
            details.Add(new($"quantile_{key}_reference", InvariantNumber.Exact(qr)));
            details.Add(new($"quantile_{key}_sample", InvariantNumber.Exact(qs)));
        }
        return effect.ToMeasurement(worst,
            $"largest quantile shift {InvariantNumber.Short(worst)} σ_ref (core bounds and median), upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
            details);
    }

    /// <summary>
    /// Both quantiles read off the fine grids (<see cref="FineGridCdf"/>): q_r and q_s by inversion, the reference's
    /// density at q_r by a central difference of its quantiles; the same standard errors.
    /// </summary>
    private static Measurement OnFineGrid(FeatureComparison c, FineGridCells reference, FineGridCells sample, double sigma, ToleranceCheck spec, DecisionSettings decision)
    {
        if (!(reference.TotalSumW > 0) || !(sample.TotalSumW > 0))
            return Measurement.Impossible("a sample's total weight on the fine grid is not positive, so its quantiles are undefined", []);
        var r = new FineGridCdf(reference);
        var s = new FineGridCdf(sample);
        var nRef = KishCount.Of(c.Reference.Histogram.TotalSumW, c.Reference.Histogram.TotalSumW2);
        var nSur = KishCount.Of(c.Surrogate.TotalSumW, c.Surrogate.TotalSumW2);
        var effect = new EffectIntersection(spec.Tolerance, decision, c.Surrogate.Entries);
        double worst = 0;
        var details = new List<KeyValuePair<string, string>>();
        foreach (var p in new[] { c.Spec.Core.LowerQuantile, 0.5, c.Spec.Core.UpperQuantile })
        {
            var qr = r.Quantile(p);
            var density = r.DensityAt(p);
            if (!(density > 0)) return Measurement.Impossible($"the reference has no density at its {p} quantile", details);
            var qs = s.Quantile(p);
            var shift = Math.Abs(qs - qr) / sigma;
            var unit = Math.Sqrt(p * (1 - p)) / density / sigma;
            worst = Math.Max(worst, shift);
            effect.Add(shift, unit / Math.Sqrt(nRef), unit / Math.Sqrt(nSur));
            var key = p.ToString("0.###", CultureInfo.InvariantCulture);
            details.Add(new($"quantile_{key}_reference", InvariantNumber.Exact(qr)));
            details.Add(new($"quantile_{key}_sample", InvariantNumber.Exact(qs)));
            details.Add(new($"density_{key}_reference", InvariantNumber.Exact(density)));
        }
        details.Add(new("quantile_grid", $"fine grid of {reference.Edges.Length - 1} cells"));
        return effect.ToMeasurement(worst,
            $"largest quantile shift {InvariantNumber.Short(worst)} σ_ref (core bounds and median), upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
            details);
    }

    /// <summary>
    /// The reference density at its p-quantile q, from the bin on the core's side: above q for p &lt; ½, below for
    /// p &gt; ½, the mean of both for the median; an outermost bin (which runs to the extreme value) only when no
    /// other bin touches q.
    /// </summary>
    internal static double CoreSideDensity(Histogram h, double q, double p)
    {
        var count = h.Axis.Count;
        double Density(int b) => b >= 0 && b < count ? h.BinSumW(b) / h.TotalSumW / (h.Axis.Upper(b) - h.Axis.Lower(b)) : 0;
        var k = h.Axis.Edges.BinarySearch(q);
        if (k < 0)
        {
            var b = ~k - 1; // q inside bin b
            if (b == 0 && count > 1 && p < 0.5) return Density(1) > 0 ? Density(1) : Density(0);
            if (b == count - 1 && count > 1 && p > 0.5) return Density(count - 2) > 0 ? Density(count - 2) : Density(count - 1);
            return Density(b);
        }
        // q is edge k: bins k − 1 (below) and k (above).
        if (p < 0.5) return Density(k) > 0 ? Density(k) : Density(k - 1);
        if (p > 0.5) return Density(k - 1) > 0 ? Density(k - 1) : Density(k);
        var below = Density(k - 1);
        var above = Density(k);
        return below > 0 && above > 0 ? (below + above) / 2 : Math.Max(below, above);
    }
}
