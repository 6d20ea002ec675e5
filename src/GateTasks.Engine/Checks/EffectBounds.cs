using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Confidence bounds, the p-value of "effect within tolerance" and the events needed to decide, for an estimate
/// with a normal standard error (the one-sided tests of Schuirmann 1987 against the upper tolerance).
/// </summary>
internal static class EffectBounds
{
    public static Measurement FromStandardError(double estimate, HistogramBootstrap.Errors se, CheckSpec spec, DecisionSettings decision,
        long surrogateEvents, string what, IReadOnlyList<KeyValuePair<string, string>> details)
    {
        var upper = EquivalenceTest.UpperBound(estimate, se.Total, decision.Confidence);
        var lower = Math.Max(0, EquivalenceTest.LowerBound(estimate, se.Total, decision.Confidence));
        var p = se.Total > 0 ? EquivalenceTest.PValueAbove(estimate, se.Total, spec.Limit) : estimate > spec.Limit ? 0 : 1;
        var z = MathNet.Numerics.Distributions.Normal.InvCDF(0, 1, decision.Confidence);
        var needed = upper >= spec.Limit && p > decision.FalseAlarm
            ? Measurement.EventsFor(Math.Abs(spec.Limit - estimate), z, se.Reference, se.Surrogate, surrogateEvents)
            : double.NaN;
        var all = details.Concat([
            new KeyValuePair<string, string>("standard_error", InvariantNumber.Exact(se.Total)),
            new("standard_error_reference_part", InvariantNumber.Exact(se.Reference)),
            new("standard_error_sample_part", InvariantNumber.Exact(se.Surrogate)),
        ]).ToList();
        return new Measurement(estimate, lower, upper, p, needed,
            $"{what} ± {InvariantNumber.Short(se.Total)}, upper bound {InvariantNumber.Short(upper)} vs tolerance {InvariantNumber.Short(spec.Limit)}", all);
    }
}
