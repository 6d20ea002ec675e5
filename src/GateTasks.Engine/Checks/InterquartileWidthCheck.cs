using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// A robust resolution: |IQR_s/IQR_r − 1|, the interquartile width (IQR/1.349 is σ for a normal core), read off both
/// histograms alike, so that a few outliers in the tails cannot move it as they move σ. The sample IQR is
/// asymptotically normal with variance [p₁(1−p₁)/f₁² + p₃(1−p₃)/f₃² − 2p₁(1−p₃)/(f₁f₃)]/n (joint normality of sample
/// quantiles, Serfling 1980, §2.3.3), f the reference histogram's density at each quartile; for a normal
/// distribution this gives the IQR estimator of σ an efficiency of 37% (Rousseeuw &amp; Croux 1993).
/// </summary>
internal static class InterquartileWidthCheck
{
    /// <summary>The normal distribution's interquartile range in units of σ, 2Φ⁻¹(0.75).</summary>
    public const double NormalIqrPerSigma = 1.3489795003921634;

    public static Measurement Evaluate(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        const double p1 = 0.25, p3 = 0.75;
        var r = c.Reference.Histogram;
        var s = c.Surrogate;
        var (q1r, f1) = r.Quantile(p1);
        var (q3r, f3) = r.Quantile(p3);
        var (q1s, _) = s.Quantile(p1);
        var (q3s, _) = s.Quantile(p3);
        var iqrRef = q3r - q1r;
        if (!(iqrRef > 0) || !(f1 > 0) || !(f3 > 0))
            return Measurement.Impossible("the reference's interquartile range is zero or its quartiles fall where it has no density", []);
        var iqrSample = q3s - q1s;
        var ratio = iqrSample / iqrRef;
        var relative = Math.Sqrt(UnitVariance(p1, p3, f1, f3)) / iqrRef; // relative standard error × √n
        var nRef = KishCount.Of(r.TotalSumW, r.TotalSumW2);
        var nSur = KishCount.Of(s.TotalSumW, s.TotalSumW2);
        var seRef = ratio * relative / Math.Sqrt(nRef);
        var seSur = ratio * relative / Math.Sqrt(nSur);
        var effect = new EffectIntersection(spec.Tolerance, decision, s.Entries);
        var deviation = Math.Abs(ratio - 1);
        effect.Add(deviation, seRef, seSur);
        var se = Math.Sqrt(seRef * seRef + seSur * seSur);
        return effect.ToMeasurement(deviation,
            $"interquartile width ratio {InvariantNumber.Short(ratio)} (IQR/1.349 {InvariantNumber.Short(iqrSample / NormalIqrPerSigma)} vs " +
            $"{InvariantNumber.Short(iqrRef / NormalIqrPerSigma)}) ± {InvariantNumber.Short(se)}, upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
            [
                new("iqr_ratio", InvariantNumber.Exact(ratio)),
                new("reference_iqr", InvariantNumber.Exact(iqrRef)),
                new("sample_iqr", InvariantNumber.Exact(iqrSample)),
                new("standard_error", InvariantNumber.Exact(se)),
            ]);
    }

    /// <summary>n × Var(q̂₃ − q̂₁): the asymptotic variance of the sample interquartile range at unit sample size.</summary>
    internal static double UnitVariance(double p1, double p3, double f1, double f3) =>
        p1 * (1 - p1) / (f1 * f1) + p3 * (1 - p3) / (f3 * f3) - 2 * p1 * (1 - p3) / (f1 * f3);
}
