using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Bin-by-bin ratio of the normalised contents, surrogate over reference, in one region; the measured value
/// is the largest |ratio − 1|. Bins empty in the reference cannot form a ratio and are counted apart
/// (the χ² and KS checks see them).
/// </summary>
internal static class BinRatioCheck
{
    public static CheckOutcome Evaluate(FeatureComparison c, CheckSpec spec)
    {
        var reference = c.Reference.Histogram;
        var surrogate = c.Surrogate;
        var axis = reference.Axis;
        var refTotal = reference.TotalSumW;
        var surTotal = surrogate.TotalSumW;

        var worst = double.NaN;
        var worstBin = -1;
        var worstRatio = double.NaN;
        var worstSigma = double.NaN;
        var compared = 0;
        var unreferenced = 0;
        var unreferencedWeight = 0.0;
        for (var b = 0; b < axis.Count; b++)
        {
            if (spec.Region == Region.Core && !c.CoreBins[b]) continue;
            if (spec.Region == Region.Tails && c.CoreBins[b]) continue;
            var cell = b + 1;
            var rw = reference.Storage.SumW[cell];
            var sw = surrogate.Storage.SumW[cell];
            if (rw <= 0)
            {
                if (sw != 0) { unreferenced++; unreferencedWeight += sw; }
                continue;
            }
            compared++;
            var ratio = surTotal > 0 ? sw / surTotal / (rw / refTotal) : 0;
            var deviation = Math.Abs(ratio - 1);
            if (!(deviation <= worst))
            {
                worst = deviation;
                worstBin = b;
                worstRatio = ratio;
                // Relative variance of each normalised content, Σw²/(Σw)², added in quadrature.
                var rel = reference.Storage.SumW2[cell] / (rw * rw) + (sw > 0 ? surrogate.Storage.SumW2[cell] / (sw * sw) : 0);
                worstSigma = ratio * Math.Sqrt(rel);
            }
        }

        var details = new List<KeyValuePair<string, string>>
        {
            new("bins_compared", compared.ToString(System.Globalization.CultureInfo.InvariantCulture)),
            new("bins_empty_in_reference", unreferenced.ToString(System.Globalization.CultureInfo.InvariantCulture)),
            new("surrogate_weight_in_empty_bins", InvariantNumber.Exact(unreferencedWeight)),
        };
        if (compared == 0)
        {
            return new CheckOutcome(c.Spec, spec, double.NaN, Verdict.Fail,
                $"the {spec.RegionName} region holds no bin with reference content; adjust the binning or the core, or switch this check off",
                details);
        }
        var range = $"[{InvariantNumber.Short(axis.Lower(worstBin))}, {InvariantNumber.Short(axis.Upper(worstBin))})";
        details.Add(new("worst_bin_lower", InvariantNumber.Exact(axis.Lower(worstBin))));
        details.Add(new("worst_bin_upper", InvariantNumber.Exact(axis.Upper(worstBin))));
        details.Add(new("worst_ratio", InvariantNumber.Exact(worstRatio)));
        details.Add(new("worst_ratio_stat_error", InvariantNumber.Exact(worstSigma)));
        return CheckOutcome.Decide(c.Spec, spec, worst,
            $"max |ratio−1| {InvariantNumber.Short(worst)} {(worst <= spec.Limit ? "≤" : ">")} {InvariantNumber.Short(spec.Limit)} in {spec.RegionName}, worst bin {range}: ratio {InvariantNumber.Short(worstRatio)} ± {InvariantNumber.Short(worstSigma)} (stat.)",
            details);
    }
}
