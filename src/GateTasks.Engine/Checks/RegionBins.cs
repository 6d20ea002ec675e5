using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
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
            for (var b = 0; b < mask.Length; b++) total += h.Storage.SumW[b + 1];
            var order = Enumerable.Range(0, mask.Length).OrderByDescending(b => h.Storage.SumW[b + 1]).ThenBy(b => b);
            var held = 0.0;
            foreach (var b in order)
            {
                if (held >= spec.Core.Fraction * total || h.Storage.SumW[b + 1] <= 0) break;
                mask[b] = true;
                held += h.Storage.SumW[b + 1];
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
}
