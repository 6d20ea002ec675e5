using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Far tails: the fractions of events beyond the reference's 0.1% and 99.9% quantiles, sample against reference;
/// the effect is the larger |Δ fraction| of the two, with the binomial errors of
/// <see cref="EffectIntersection.AddFraction"/>; the 95% Clopper–Pearson (1934) interval of each sample fraction is
/// reported alongside.
/// </summary>
internal static class FarTailCheck
{
    public static Measurement Evaluate(FeatureComparison c, ToleranceCheck spec, DecisionSettings decision)
    {
        if (c.Reference.FarTail is not { } r)
            return Measurement.Impossible("the reference holds no far-tail counts; rebuild it with 'gatetasks reference build'", []);
        if (c.SampleFarTail is not { } s) return Measurement.Impossible("the sample's far tails were not counted", []);
        var effect = new EffectIntersection(spec.Tolerance, decision, c.Surrogate.Entries);
        var details = new List<KeyValuePair<string, string>>
        {
            new("low_threshold", InvariantNumber.Exact(r.Low)), new("high_threshold", InvariantNumber.Exact(r.High)),
        };
        var worst = 0.0;
        foreach (var (side, rw, sw) in new[] { ("below", r.BelowW, s.BelowW), ("above", r.AboveW, s.AboveW) })
        {
            var (fr, fs, ns) = effect.AddFraction(rw, r.TotalW, r.TotalW2, sw, s.TotalW, s.TotalW2);
            worst = Math.Max(worst, Math.Abs(fs - fr));
            var k = (long)Math.Round(fs * ns);
            var (lo, hi) = Statistics.BinomialInterval.ClopperPearson(Math.Max(0, k), Math.Max((long)Math.Round(ns), 1), 0.95);
            details.Add(new($"fraction_{side}_reference", InvariantNumber.Exact(fr)));
            details.Add(new($"fraction_{side}_sample", InvariantNumber.Exact(fs)));
            details.Add(new($"fraction_{side}_sample_cp95_lower", InvariantNumber.Exact(lo)));
            details.Add(new($"fraction_{side}_sample_cp95_upper", InvariantNumber.Exact(hi)));
        }
        return effect.ToMeasurement(worst,
            $"far-tail fractions beyond the reference's 0.1%/99.9% quantiles: largest |Δ| {InvariantNumber.Short(worst)}, upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
            details);
    }
}
