using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Which regular bins belong to the core. Continuous: a bin is core when its centre lies between the reference's
/// quantiles at the core's probabilities. Discrete: the most populated categories, taken in order of reference
/// weight until they hold the core's fraction. Every other bin is a tail bin.
/// </summary>
internal static class RegionBins
{
    public static bool[] Core(ReferenceFeature reference, FeatureSpec spec)
    {
        var h = reference.Histogram;
        var mask = new bool[h.Axis.Count];
        if (spec.Kind == FeatureKind.Discrete)
        {
            var total = 0.0;
            for (var b = 0; b < mask.Length; b++) total += h.BinSumW(b);
            var order = Enumerable.Range(0, mask.Length).OrderByDescending(b => h.BinSumW(b)).ThenBy(b => b);
            var held = 0.0;
            foreach (var b in order)
            {
                if (held >= spec.Core.Fraction * total || h.BinSumW(b) <= 0) break;
                mask[b] = true;
                held += h.BinSumW(b);
            }
            return mask;
        }
        var lo = reference.Quantile(spec.Core.LowerQuantile);
        var hi = reference.Quantile(spec.Core.UpperQuantile);
        if (lo is null || hi is null)
            throw new GateInputException(ErrorCodes.ReferenceMismatch,
                $"The reference for feature '{spec.Name}' was built without the quantiles of this core " +
                $"({spec.Core.LowerQuantile}, {spec.Core.UpperQuantile}); rebuild it with 'gatetasks reference build'.", spec.Core.Location);
        for (var b = 0; b < mask.Length; b++)
        {
            var centre = h.Axis.Centre(b);
            mask[b] = centre >= lo && centre <= hi;
        }
        return mask;
    }

    /// <summary>
    /// The regular bins a check's region covers: every bin, the core's, the tails' (every non-core bin), or a named
    /// region's (bin centre within its range).
    /// </summary>
    public static bool[] Covered(FeatureComparison c, RegionToleranceCheck spec)
    {
        var axis = c.Reference.Histogram.Axis;
        var (lower, upper) = NamedBounds(c, spec);
        var mask = new bool[axis.Count];
        for (var b = 0; b < mask.Length; b++)
            mask[b] = spec.Region.Kind switch
            {
                Region.Core => c.CoreBins[b],
                Region.Tails => !c.CoreBins[b],
                Region.Named => axis.Centre(b) >= lower && axis.Centre(b) <= upper,
                _ => true,
            };
        return mask;
    }

    /// <summary>The value range of a named region: explicit, or between the reference histogram's quantiles.</summary>
    private static (double Lower, double Upper) NamedBounds(FeatureComparison c, RegionToleranceCheck spec)
    {
        if (spec.Region.Kind != Region.Named) return (double.NaN, double.NaN);
        var region = c.Spec.Regions?.FirstOrDefault(g => g.Name == spec.Region.Name)
            ?? throw new InvalidOperationException($"Region '{spec.Region.Name}' was not declared; the contract loader should have refused it.");
        return NamedRegionRange.Of(c.Reference.Histogram, region);
    }
}
