using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Checks;

/// <summary>
/// The decision quantities of a distance between two distributions (W₁, Jensen–Shannon), which is positive even
/// when the truth is zero, made honest at the tolerance from both sides:
/// <list type="bullet">
/// <item>Pass: the bias-corrected estimate θ̂ − b̂ (bootstrap bias, Efron &amp; Tibshirani 1993, ch. 10) plus z
/// bootstrap standard errors lies below the tolerance.</item>
/// <item>Fail: the p-value of "within tolerance" is P(D* ≥ θ̂) for D* drawn from a pair of laws exactly at the
/// tolerance (<see cref="HistogramBootstrap.BoundaryReplicas"/>), so the estimate's own floor is part of the null
/// law, not taken for an effect.</item>
/// </list>
/// </summary>
internal static class DistanceDecision
{
    /// <summary>
    /// One measurement from the distance as measured (<paramref name="estimate"/>), its bootstrap bias and standard
    /// errors, and the distance in replicas drawn at the tolerance (<paramref name="boundary"/>; null when the estimate
    /// is within the tolerance, where the check cannot fail).
    /// </summary>
    public static Measurement Measure(double estimate, double bias, HistogramBootstrap.Errors se, double[]? boundary,
        ToleranceCheck spec, DecisionSettings decision, long surrogateEvents, string what, IReadOnlyList<KeyValuePair<string, string>> details)
    {
        var z = Normal.InvCDF(0, 1, decision.Confidence);
        var corrected = Math.Max(0, estimate - bias);
        var upper = corrected + z * se.Total;
        var lower = Math.Max(0, corrected - z * se.Total);
        var p = boundary is null ? 1 : HistogramBootstrap.TailProbability(boundary, estimate);
        var effect = new EffectIntersection(spec.Tolerance, decision, surrogateEvents);
        effect.AddBounded(corrected, lower, upper, p, se.Reference, se.Surrogate);
        var all = details.Concat([
            new KeyValuePair<string, string>("estimate_uncorrected", InvariantNumber.Exact(estimate)),
            new("bootstrap_bias", InvariantNumber.Exact(bias)),
            new("standard_error", InvariantNumber.Exact(se.Total)),
            new("standard_error_reference_part", InvariantNumber.Exact(se.Reference)),
            new("standard_error_sample_part", InvariantNumber.Exact(se.Surrogate)),
        ]).ToList();
        if (boundary is not null) all.Add(new("at_tolerance_mean", InvariantNumber.Exact(boundary.Average())));
        return effect.ToMeasurement(corrected,
            $"{what} (bias-corrected; {InvariantNumber.Short(estimate)} as measured) ± {InvariantNumber.Short(se.Total)}, " +
            $"upper bound {InvariantNumber.Short(upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}", all);
    }
}
