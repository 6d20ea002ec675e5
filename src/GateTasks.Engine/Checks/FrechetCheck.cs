using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// <c>frechet-max</c>: the Fréchet distance |μ₁ − μ₂|² + Tr(Σ₁ + Σ₂ − 2(Σ₁Σ₂)^½) between Gaussian fits of the
/// standardised joint features of reference and sample, every event with its weight, with the finite-size bias removed
/// by extrapolation in 1/N (Chong &amp; Forsyth 2020; Kansal et al. 2023, Phys. Rev. D 107, 076017) and the
/// delete-one-block jackknife standard error, which leaves each block out of both sides and so carries both samples'
/// noise (<see cref="FrechetExtrapolation"/>). Decided as every tolerance check: the normal upper bound
/// estimate + z·SE against the tolerance, and the p-value of "within tolerance" at the tolerance's edge.
/// </summary>
internal static class FrechetCheck
{
    /// <remarks><paramref name="estimate"/>, when given, is the estimate of these same moments, computed once for this check and the global score.</remarks>
    public static Measurement Evaluate(AccumulatedJointMoments reference, AccumulatedJointMoments sample, ToleranceCheck spec, DecisionSettings decision, long sampleEvents,
        Lazy<FrechetEstimate>? estimate = null)
    {
        if (reference.Moments is not { } r || sample.Moments is not { } s)
            return Measurement.Impossible("no joint moments were gathered", []);
        FrechetEstimate extrapolated;
        GaussianFit referenceFit, sampleFit;
        try
        {
            extrapolated = estimate?.Value ?? FrechetExtrapolation.Of(r, s);
            (referenceFit, sampleFit) = (r.Fit(), s.Fit());
        }
        catch (ArgumentException e)
        {
            return Measurement.Impossible($"the Fréchet distance of these moments: {e.Message}", []);
        }
        var details = new List<KeyValuePair<string, string>>
        {
            new("extrapolated", InvariantNumber.Exact(extrapolated.Extrapolated)), new("standard_error", InvariantNumber.Exact(extrapolated.StandardError)),
            new("all_events", InvariantNumber.Exact(extrapolated.Raw)), new("slope", InvariantNumber.Exact(extrapolated.Slope)),
            new("reference_rows", InvariantNumber.Count(reference.Rows)), new("sample_rows", InvariantNumber.Count(sample.Rows)),
            new("sample_rows_skipped", InvariantNumber.Count(sample.Skipped)), new("blocks", InvariantNumber.Count(r.Blocks)),
        };
        if (!double.IsFinite(extrapolated.Extrapolated) || !double.IsFinite(extrapolated.StandardError))
            return Measurement.Impossible(
                $"some block of {r.Blocks} has no defined Gaussian fit (too few rows, or event weights that cancel), so the distance cannot be extrapolated or its error estimated " +
                $"({InvariantNumber.Count(reference.Rows)} reference and {InvariantNumber.Count(sample.Rows)} sample rows)", details);
        var (seReference, seSample) = JointErrorSplit.Of(extrapolated.StandardError, referenceFit.EffectiveCount, sampleFit.EffectiveCount);
        var effect = new EffectIntersection(spec.Tolerance, decision, sampleEvents);
        effect.Add(extrapolated.Extrapolated, seReference, seSample);
        return effect.ToMeasurement(extrapolated.Extrapolated,
            $"Fréchet distance {InvariantNumber.Short(extrapolated.Extrapolated)} ± {InvariantNumber.Short(extrapolated.StandardError)} extrapolated to infinite size " +
            $"({InvariantNumber.Short(extrapolated.Raw)} on all {InvariantNumber.Count(sample.Rows)} sample rows), upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
            details);
    }
}
