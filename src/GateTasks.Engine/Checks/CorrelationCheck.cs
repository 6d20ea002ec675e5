using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;
using GateTasks.Engine.Statistics;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Checks;

/// <summary>
/// |Δ r| of a declared pair (Pearson, or Spearman on ranks under the reference's marginals) between sample and
/// reference, with each coefficient's distribution-free large-sample standard error: each sample's own asymptotic
/// variance from its fourth moments (<see cref="WeightedCorrelation.AsymptoticVariance"/>) over its Kish effective
/// count (<see cref="WeightedCorrelation.StandardError"/>). Spearman's ρ is the Pearson correlation of ranks under
/// the reference's marginal CDFs, so the same variance is taken on the ranks; it treats those marginals as fixed
/// (their estimation error, of the order of the reference's own, is neglected).
/// </summary>
internal static class CorrelationCheck
{
    public static Measurement Evaluate(ReferenceCorrelation reference, AccumulatedPair sample, ToleranceCheck spec, DecisionSettings decision, long sampleEvents)
    {
        var spearman = spec.Kind == CheckKind.SpearmanDifference;
        var r = spearman ? reference.Spearman : reference.Pearson;
        var s = spearman ? sample.Spearman : sample.Pearson;
        if (double.IsNaN(s)) return Measurement.Impossible("the sample's correlation is undefined: one of the two features is constant or all NaN, or the event weights cancel exactly", []);
        var effect = new EffectIntersection(spec.Tolerance, decision, sampleEvents);
        var d = Math.Abs(s - r);
        var referenceVariance = spearman ? reference.SpearmanVariance : reference.PearsonVariance;
        var sampleVariance = spearman ? sample.SpearmanVariance : sample.PearsonVariance;
        effect.Add(d, WeightedCorrelation.StandardError(referenceVariance, reference.EffectiveCount), WeightedCorrelation.StandardError(sampleVariance, sample.EffectiveCount));
        var name = spearman ? "Spearman ρ" : "Pearson r";
        return effect.ToMeasurement(d,
            $"{name} {InvariantNumber.Short(s)} vs {InvariantNumber.Short(r)}: |Δ| {InvariantNumber.Short(d)}, upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
            [new("sample_coefficient", InvariantNumber.Exact(s)), new("reference_coefficient", InvariantNumber.Exact(r))]);
    }
}
