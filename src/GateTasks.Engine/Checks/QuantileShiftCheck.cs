using System.Globalization;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Shifts of the quantiles that bound the core, and of the median, in units of the reference's standard
/// deviation: the effect is the largest |q_s(p) − q_r(p)|/σ_r. Both quantiles are read off the histograms with
/// the same binning (linear within a bin), so binning cannot bias the comparison. Each has the asymptotic standard
/// error √(p(1−p)/n)/f(q_p) (Serfling 1980, §2.3), f the reference histogram's density at q_p; as for the bin
/// ratios, a pass needs every quantile's bound below the tolerance, and the fail p-value is Bonferroni-corrected
/// over the three.
/// </summary>
internal static class QuantileShiftCheck
{
    public static Measurement Evaluate(FeatureComparison c, CheckSpec spec, DecisionSettings decision)
    {
        var sigma = c.Reference.Summary.StandardDeviation;
        if (!(sigma > 0)) return Measurement.Impossible("the reference's standard deviation is zero, so a quantile shift in its units is undefined", []);
        var r = c.Reference.Histogram;
        var s = c.Surrogate;
        var nRef = KolmogorovSmirnovCheck.Kish(r.TotalSumW, r.TotalSumW2);
        var nSur = KolmogorovSmirnovCheck.Kish(s.TotalSumW, s.TotalSumW2);
        var effect = new EffectIntersection(spec.Limit, decision, s.Entries);
        double[] probabilities = [c.Spec.Core.LowerQuantile, 0.5, c.Spec.Core.UpperQuantile];

        double worst = 0;
        var details = new List<KeyValuePair<string, string>>();
        foreach (var p in probabilities)
        {
            var (qr, density) = Quantile(r, p);
            var (qs, _) = Quantile(s, p);
            if (!(density > 0)) return Measurement.Impossible($"the reference histogram has no density at its {p} quantile", details);
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
            $"largest quantile shift {InvariantNumber.Short(worst)} σ_ref (core bounds and median), upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Limit)}",
            details);
    }

    /// <summary>The p-quantile of a histogram (linear within its bin) and the density there; flows sit at the axis ends.</summary>
    internal static (double Value, double Density) Quantile(Histogram h, double p)
    {
        var w = h.Storage.SumW;
        var total = h.TotalSumW;
        var target = p * total;
        var cumulative = w[0];
        var edges = h.Axis.Edges;
        if (cumulative >= target) return (edges[0], 0);
        for (var b = 0; b < h.Axis.Count; b++)
        {
            var content = w[b + 1];
            if (cumulative + content >= target && content > 0)
            {
                var width = edges[b + 1] - edges[b];
                return (edges[b] + (target - cumulative) / content * width, content / total / width);
            }
            cumulative += content;
        }
        return (edges[^1], 0);
    }
}
