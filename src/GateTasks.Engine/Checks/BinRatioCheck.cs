using System.Globalization;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Bin-by-bin ratio of the normalised contents, surrogate over reference, in one region; the effect is the largest
/// |ratio − 1|. Each ratio's interval and p-value come from the count expected under the ratio judged, with both
/// samples' errors, and from the exact conditional binomial for small counts (<see cref="BinRatio"/>). Pass: every
/// bin's upper bound of |ρ − 1| lies below the tolerance — an intersection–union test, valid at the stated confidence
/// without a multiplicity correction (Berger 1982). Fail: the smallest per-bin p-value of "|r − 1| ≤ tolerance",
/// Bonferroni-corrected over the region's bins, enters the contract's family. Bins empty in the reference cannot
/// form a ratio and are counted apart (the χ² and KS checks see them).
/// </summary>
internal static class BinRatioCheck
{
    public static Measurement Evaluate(FeatureComparison c, RegionToleranceCheck spec, DecisionSettings decision)
    {
        var reference = c.Reference.Histogram;
        var surrogate = c.Surrogate;
        var axis = reference.Axis;
        var effect = new EffectIntersection(spec.Tolerance, decision, surrogate.Entries);

        var worst = double.NaN;
        var worstBin = -1;
        var worstRatio = double.NaN;
        var worstSigma = double.NaN;
        var compared = 0;
        var unreferenced = 0;
        var unreferencedWeight = 0.0;
        var covered = RegionBins.Covered(c, spec);
        for (var b = 0; b < axis.Count; b++)
        {
            if (!covered[b]) continue;
            if (BinRatio.Of(reference, surrogate, b) is not { } bin)
            {
                var sw = surrogate.BinSumW(b);
                if (sw != 0) { unreferenced++; unreferencedWeight += sw; }
                continue;
            }
            compared++;
            var ratio = bin.Ratio;
            var deviation = Math.Abs(ratio - 1);
            var (lo, hi) = bin.Bounds(decision.Confidence);
            var lowerDeviation = lo > 1 ? lo - 1 : hi < 1 ? 1 - hi : 0;
            // The error parts at the ratio nearest the observed one that the tolerance allows, for the events needed.
            var (sigmaRef, sigmaSur) = bin.SigmaAt(Math.Clamp(ratio, Math.Max(1 - spec.Tolerance, 0), 1 + spec.Tolerance));
            var sigma = bin.Sigma;
            effect.AddBounded(deviation, lowerDeviation, Math.Max(hi - 1, 1 - lo), bin.PValueWithin(spec.Tolerance), sigmaRef, sigmaSur);
            if (!(deviation <= worst))
            {
                worst = deviation;
                worstBin = b;
                worstRatio = ratio;
                worstSigma = sigma;
            }
        }

        var details = new List<KeyValuePair<string, string>>
        {
            new("bins_compared", compared.ToString(CultureInfo.InvariantCulture)),
            new("bins_empty_in_reference", unreferenced.ToString(CultureInfo.InvariantCulture)),
            new("surrogate_weight_in_empty_bins", InvariantNumber.Exact(unreferencedWeight)),
        };
        if (compared == 0)
            return Measurement.Impossible(
                $"the {spec.RegionName} region holds no bin with reference content; adjust the binning or the core, or switch this check off", details);

        var range = $"[{InvariantNumber.Short(axis.Lower(worstBin))}, {InvariantNumber.Short(axis.Upper(worstBin))})";
        details.Add(new("worst_bin_lower", InvariantNumber.Exact(axis.Lower(worstBin))));
        details.Add(new("worst_bin_upper", InvariantNumber.Exact(axis.Upper(worstBin))));
        details.Add(new("worst_ratio", InvariantNumber.Exact(worstRatio)));
        details.Add(new("worst_ratio_stat_error", InvariantNumber.Exact(worstSigma)));
        return effect.ToMeasurement(worst,
            $"max |ratio−1| {InvariantNumber.Short(worst)} in {spec.RegionName} (worst bin {range}: ratio {InvariantNumber.Short(worstRatio)} ± {InvariantNumber.Short(worstSigma)}), " +
            $"upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Tolerance)}",
            details);
    }
}
