using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Confidence bounds, the p-value of "effect within tolerance" and the events needed to decide, for an estimate
/// with a normal standard error (the one-sided tests of Schuirmann 1987 against the upper tolerance).
/// </summary>
internal static class EffectBounds
{
    public static Measurement FromStandardError(double estimate, HistogramBootstrap.Errors se, ToleranceCheck spec, DecisionSettings decision,
        long surrogateEvents, string what, IReadOnlyList<KeyValuePair<string, string>> details)
    {
        var effect = new EffectIntersection(spec.Tolerance, decision, surrogateEvents);
        effect.Add(estimate, se.Reference, se.Surrogate);
        var all = details.Concat([
            new KeyValuePair<string, string>("standard_error", InvariantNumber.Exact(se.Total)),
            new("standard_error_reference_part", InvariantNumber.Exact(se.Reference)),
            new("standard_error_sample_part", InvariantNumber.Exact(se.Surrogate)),
        ]).ToList();
        return effect.ToMeasurement(estimate,
            $"{what} ± {InvariantNumber.Short(se.Total)}, upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}", all);
    }
}
