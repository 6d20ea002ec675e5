using System.Globalization;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Bin-by-bin ratio of the normalised contents, surrogate over reference, in one region; the effect is the largest
/// |ratio − 1|. Each ratio's standard error comes from Σw² of both histograms (delta method). Pass: every bin's
/// upper bound |r − 1| + z·σ lies below the tolerance — an intersection–union test, valid at the stated confidence
/// without a multiplicity correction (Berger 1982). Fail: the smallest per-bin p-value of "|r − 1| ≤ tolerance",
/// Bonferroni-corrected over the region's bins, enters the contract's family. Bins empty in the reference cannot
/// form a ratio and are counted apart (the χ² and KS checks see them).
/// </summary>
internal static class BinRatioCheck
{
    /// <summary>The value range of a named region: explicit, or between the reference histogram's quantiles.</summary>
    private static (double Lower, double Upper) NamedBounds(FeatureComparison c, CheckSpec spec)
    {
        if (spec.Region != Region.Named) return (double.NaN, double.NaN);
        var region = c.Spec.Regions?.FirstOrDefault(g => g.Name == spec.Named)
            ?? throw new InvalidOperationException($"Region '{spec.Named}' was not declared; the contract loader should have refused it.");
        return region.ByQuantile
            ? (QuantileShiftCheck.Quantile(c.Reference.Histogram, region.Lower).Value, QuantileShiftCheck.Quantile(c.Reference.Histogram, region.Upper).Value)
            : (region.Lower, region.Upper);
    }

    public static Measurement Evaluate(FeatureComparison c, CheckSpec spec, DecisionSettings decision)
    {
        var reference = c.Reference.Histogram;
        var surrogate = c.Surrogate;
        var axis = reference.Axis;
        var refTotal = reference.TotalSumW;
        var surTotal = surrogate.TotalSumW;
        var surEffective = KolmogorovSmirnovCheck.Kish(surTotal, surrogate.TotalSumW2);
        var effect = new EffectIntersection(spec.Limit, decision, surrogate.Entries);

        var worst = double.NaN;
        var worstBin = -1;
        var worstRatio = double.NaN;
        var worstSigma = double.NaN;
        var compared = 0;
        var unreferenced = 0;
        var unreferencedWeight = 0.0;
        var (namedLower, namedUpper) = NamedBounds(c, spec);
        for (var b = 0; b < axis.Count; b++)
        {
            if (spec.Region == Region.Core && !c.CoreBins[b]) continue;
            if (spec.Region == Region.Tails && c.CoreBins[b]) continue;
            if (spec.Region == Region.Named && !(axis.Centre(b) >= namedLower && axis.Centre(b) <= namedUpper)) continue;
            var cell = b + 1;
            var rw = reference.Storage.SumW[cell];
            var sw = surrogate.Storage.SumW[cell];
            if (rw <= 0)
            {
                if (sw != 0) { unreferenced++; unreferencedWeight += sw; }
                continue;
            }
            compared++;
            var fraction = rw / refTotal;
            var ratio = surTotal > 0 ? sw / surTotal / fraction : 0;
            // Relative variances of the two normalised contents; an empty surrogate bin takes the variance expected from the reference.
            var relRef = reference.Storage.SumW2[cell] / (rw * rw);
            var relSur = sw > 0 ? surrogate.Storage.SumW2[cell] / (sw * sw) : 1 / Math.Max(fraction * surEffective, 1e-300);
            var sigmaRef = Math.Max(ratio, 1e-12) * Math.Sqrt(relRef);
            var sigmaSur = Math.Max(ratio, 1e-12) * Math.Sqrt(relSur);
            var sigma = Math.Sqrt(sigmaRef * sigmaRef + sigmaSur * sigmaSur);
            var deviation = Math.Abs(ratio - 1);
            effect.Add(deviation, sigmaRef, sigmaSur);
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
            $"upper bound {InvariantNumber.Short(effect.Upper)} vs tolerance {InvariantNumber.Short(spec.Limit)}",
            details);
    }
}
