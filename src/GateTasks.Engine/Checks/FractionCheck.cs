using System.Globalization;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Absolute fraction differences: of the declared spike of a continuous feature (its share of all non-NaN events),
/// or of every category of a discrete feature; the effect is the largest |f_sample − f_reference|, one multinomial
/// effect decided with a simultaneous band over the categories (<see cref="FractionBand"/>), each fraction with the
/// binomial error of <see cref="EffectIntersection.AddFraction"/> (the normal approximation that Wilson's 1927
/// interval refines). It enters the contract's family as one p-value.
/// </summary>
internal static class FractionCheck
{
    public static Measurement Evaluate(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        var r = c.Reference.Histogram;
        var s = c.Surrogate;
        var effect = new FractionBand(spec.Tolerance, decision, s.Entries);
        var details = new List<KeyValuePair<string, string>>();

        void Part(string name, double refW, double refTotal, double refTotalW2, double sampleW, double sampleTotal, double sampleTotalW2)
        {
            var (fr, fs) = effect.AddFraction(refW, refTotal, refTotalW2, sampleW, sampleTotal, sampleTotalW2);
            details.Add(new($"fraction_{name}_reference", InvariantNumber.Exact(fr)));
            details.Add(new($"fraction_{name}_sample", InvariantNumber.Exact(fs)));
        }

        if (c.Reference.Spike is { } refSpike)
        {
            var sampleSpike = c.SampleSpike ?? new Accumulation.SpikeTally(refSpike.Value, 0, 0, 0);
            Part("spike", refSpike.SumW, refSpike.SumW + r.TotalSumW, refSpike.SumW2 + r.TotalSumW2,
                sampleSpike.SumW, sampleSpike.SumW + s.TotalSumW, sampleSpike.SumW2 + s.TotalSumW2);
            return effect.ToMeasurement(
                $"spike fraction at {InvariantNumber.Short(refSpike.Value)}: |Δ| {InvariantNumber.Short(effect.Estimate)}, upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
                details);
        }
        if (c.Spec.Kind != FeatureKind.Discrete)
            return Measurement.Impossible("fraction-max needs a discrete feature or a declared spike value ('spike:' in the feature)", []);

        double refTotalW = r.TotalSumW, refTotalW2 = r.TotalSumW2, sampleTotalW = s.TotalSumW, sampleTotalW2 = s.TotalSumW2;
        for (var b = 0; b < r.Axis.Count; b++)
        {
            if (r.BinSumW(b) <= 0 && s.BinSumW(b) <= 0) continue;
            var category = Math.Round(r.Axis.Centre(b)).ToString(CultureInfo.InvariantCulture);
            Part(category, r.BinSumW(b), refTotalW, refTotalW2, s.BinSumW(b), sampleTotalW, sampleTotalW2);
        }
        if (effect.Parts == 0) return Measurement.Impossible("no category holds any event", details);
        return effect.ToMeasurement(
            $"largest category-fraction difference {InvariantNumber.Short(effect.Estimate)} over {effect.Parts} categories, simultaneous lower bound {InvariantNumber.Short(effect.Lower)}, upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
            details);
    }
}
