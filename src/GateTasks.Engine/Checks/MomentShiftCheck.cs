using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Shifts of the first two moments, from the unbinned streamed moments of both samples at Kish effective counts.
/// Mean: |μ_s − μ_r|/σ_r with standard error √(σ_s²/n_s + σ_r²/n_r)/σ_r. Width: |σ_s/σ_r − 1| with the delta-method
/// variance of a standard deviation, (κ − 1)/(4n) relative, κ each sample's unbinned kurtosis (the reference
/// histogram's, at bin centres, where none was streamed) — exact for any distribution with a finite fourth moment as
/// n grows (Kendall &amp; Stuart, vol. 1, ch. 10); with heavy tails the width is a poor measure of resolution.
/// </summary>
internal static class MomentShiftCheck
{
    public static Measurement Mean(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        var r = c.Reference.Summary;
        var s = c.SurrogateSummary;
        if (!(r.StandardDeviation > 0))
            return Measurement.Impossible("the reference's standard deviation is zero, so a shift in its units is undefined", []);
        var shift = Math.Abs(s.Mean - r.Mean) / r.StandardDeviation;
        var seRef = 1 / Math.Sqrt(r.EffectiveCount);
        var seSur = s.StandardDeviation / r.StandardDeviation / Math.Sqrt(s.EffectiveCount);
        return Folded(shift, seRef, seSur, spec, decision, c.Surrogate.Entries,
            $"mean shift {InvariantNumber.Short(shift)} σ_ref (means {InvariantNumber.Short(s.Mean)} vs {InvariantNumber.Short(r.Mean)})",
            [new("sample_mean", InvariantNumber.Exact(s.Mean)), new("reference_mean", InvariantNumber.Exact(r.Mean))]);
    }

    public static Measurement Width(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        var r = c.Reference.Summary;
        var s = c.SurrogateSummary;
        if (!(r.StandardDeviation > 0))
            return Measurement.Impossible("the reference's standard deviation is zero, so a width ratio is undefined", []);
        var ratio = s.StandardDeviation / r.StandardDeviation;
        // Each sample's own unbinned kurtosis where it was streamed; the reference histogram's otherwise.
        var kappaRef = double.IsFinite(r.Kurtosis) ? r.Kurtosis : Kurtosis(c);
        var kappaSample = double.IsFinite(s.Kurtosis) ? s.Kurtosis : kappaRef;
        var kappa = kappaRef;
        var seRef = ratio * Math.Sqrt((kappaRef - 1) / (4 * r.EffectiveCount));
        var seSur = ratio * Math.Sqrt((kappaSample - 1) / (4 * s.EffectiveCount));
        return Folded(Math.Abs(ratio - 1), seRef, seSur, spec, decision, c.Surrogate.Entries,
            $"width ratio {InvariantNumber.Short(ratio)} (σ {InvariantNumber.Short(s.StandardDeviation)} vs {InvariantNumber.Short(r.StandardDeviation)})",
            [new("width_ratio", InvariantNumber.Exact(ratio)), new("kurtosis_used", InvariantNumber.Exact(kappa))]);
    }

    /// <summary>Bounds and p-value for a deviation that is roughly normal with the given error parts.</summary>
    private static Measurement Folded(double deviation, double seRef, double seSur, ToleranceCheck spec, DecisionSettings decision, long events,
        string what, List<KeyValuePair<string, string>> details)
    {
        var effect = new EffectIntersection(spec.Tolerance, decision, events);
        effect.Add(deviation, seRef, seSur);
        details.Add(new("standard_error", InvariantNumber.Exact(Math.Sqrt(seRef * seRef + seSur * seSur))));
        return effect.ToMeasurement(deviation,
            $"{what} ± {InvariantNumber.Short(Math.Sqrt(seRef * seRef + seSur * seSur))}, upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}", details);
    }

    /// <summary>μ₄/σ⁴ of the reference histogram at bin centres (at least 1, the smallest any distribution has).</summary>
    private static double Kurtosis(FeatureComparison c)
    {
        var h = c.Reference.Histogram;
        double w = 0, m1 = 0;
        for (var b = 0; b < h.Axis.Count; b++) { w += h.BinSumW(b); m1 += h.BinSumW(b) * h.Axis.Centre(b); }
        if (!(w > 0)) return 3;
        m1 /= w;
        double m2 = 0, m4 = 0;
        for (var b = 0; b < h.Axis.Count; b++)
        {
            var d = h.Axis.Centre(b) - m1;
            m2 += h.BinSumW(b) * d * d;
            m4 += h.BinSumW(b) * d * d * d * d;
        }
        m2 /= w;
        m4 /= w;
        return m2 > 0 ? Math.Max(1, m4 / (m2 * m2)) : 3;
    }
}
