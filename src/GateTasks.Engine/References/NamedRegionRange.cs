using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.References;

/// <summary>The value range of a named region: explicit, or between the reference histogram's quantiles.</summary>
internal static class NamedRegionRange
{
    /// <summary>The value range of <paramref name="region"/> on the reference histogram <paramref name="reference"/>.</summary>
    public static (double Lower, double Upper) Of(Histogram reference, NamedRegion region) =>
        region.ByQuantile
            ? (reference.Quantile(region.Lower).Value, reference.Quantile(region.Upper).Value)
            : (region.Lower, region.Upper);
}
