using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Checks;

/// <summary>
/// The decision quantities of a distance between two distributions (W₁, Jensen–Shannon), which is positive even
/// when the truth is zero, made honest at the tolerance:
/// <list type="bullet">
/// <item>Pass side: the bias-corrected estimate θ̂ − b̂ (bootstrap bias, Efron &amp; Tibshirani 1993, ch. 10) plus z
/// bootstrap standard errors must lie below the tolerance.</item>
/// <item>Fail side: for a metric d (W₁ itself; √JSD, a metric by Endres &amp; Schindelin 2003) the triangle inequality
/// gives d(F̂, Ĝ) ≤ d(F, G) + d_noise, where d_noise is the distance the sampling noise alone makes, distributed as
/// the estimate between two samples of one law (<see cref="HistogramBootstrap.NullReplicas"/>). So when the truth
/// is within tolerance, P(d̂ − d_tol ≥ c) ≤ P(d_noise ≥ c): the p-value of "within tolerance" is that tail at the
/// observed excess, exact at zero distance and conservative above. The lower bound is the test inverted.</item>
/// </list>
/// </summary>
internal static class DistanceDecision
{
    /// <summary>
    /// One measurement from the distance as measured (<paramref name="estimate"/>), its bootstrap bias and standard
    /// errors, and the distance between two samples of one law at the two samples' sizes (<paramref name="nullReplicas"/>);
    /// <paramref name="squaredMetric"/> says the distance is the square of a metric (JSD = (√JSD)²) rather than one (W₁).
    /// </summary>
    public static Measurement Measure(double estimate, double bias, HistogramBootstrap.Errors se, IReadOnlyList<double> nullReplicas, bool squaredMetric,
        ToleranceCheck spec, DecisionSettings decision, long surrogateEvents, string what, IReadOnlyList<KeyValuePair<string, string>> details)
    {
        double Metric(double x) => squaredMetric ? Math.Sqrt(Math.Max(0, x)) : x;
        double FromMetric(double m) => squaredMetric ? m * m : m;
        var z = Normal.InvCDF(0, 1, decision.Confidence);
        var corrected = Math.Max(0, estimate - bias);
        var upper = corrected + z * se.Total;
        // The noise replicas are distances (W₁, or JSD = d²); the excess is in metric units.
        var excess = Metric(estimate) - Metric(spec.Tolerance);
        var p = excess > 0 ? HistogramBootstrap.TailProbability(nullReplicas, FromMetric(excess)) : 1;
        var noiseQuantile = Metric(HistogramBootstrap.Quantile(nullReplicas, decision.Confidence));
        var lower = FromMetric(Math.Max(0, Metric(estimate) - noiseQuantile));
        var effect = new EffectIntersection(spec.Tolerance, decision, surrogateEvents);
        effect.AddBounded(corrected, lower, upper, p, se.Reference, se.Surrogate);
        var all = details.Concat([
            new KeyValuePair<string, string>("estimate_uncorrected", InvariantNumber.Exact(estimate)),
            new("bootstrap_bias", InvariantNumber.Exact(bias)),
            new("noise_floor_mean", InvariantNumber.Exact(nullReplicas.Count > 0 ? nullReplicas.Average() : 0)),
            new("standard_error", InvariantNumber.Exact(se.Total)),
            new("standard_error_reference_part", InvariantNumber.Exact(se.Reference)),
            new("standard_error_sample_part", InvariantNumber.Exact(se.Surrogate)),
        ]).ToList();
        return effect.ToMeasurement(corrected,
            $"{what} (bias-corrected; {InvariantNumber.Short(estimate)} as measured) ± {InvariantNumber.Short(se.Total)}, " +
            $"upper bound {InvariantNumber.Short(upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}", all);
    }
}
