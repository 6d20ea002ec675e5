using System.Globalization;
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
/// </summary>
internal static class QuantileShiftCheck
{
    public static Measurement Evaluate(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        var sigma = c.Reference.Summary.StandardDeviation;
        if (!(sigma > 0)) return Measurement.Impossible("the reference's standard deviation is zero, so a quantile shift in its units is undefined", []);
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
