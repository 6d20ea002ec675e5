using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;

namespace GateTasks.Engine.References;

/// <summary>
/// Whether a feature's bins hold the reference. Explicit edges or a range can be written where the reference has
/// few or no events; its events then fall in the flow cells (below the first edge, above the last), which no binned
/// check compares, and a sample of any shape passes. Refused when the reference is built and again when it is used.
/// </summary>
internal static class BinCoverage
{
    /// <summary>The least share of the reference's weight (NaN aside) that the bins, flows aside, must hold.</summary>
    public const double MinimumShare = 0.5;

    /// <summary>The share of a histogram's weight (NaN aside) below the first edge, inside the bins, and above the last edge.</summary>
    public static (double Below, double Inside, double Above) Shares(Histogram h)
    {
        var total = h.TotalSumW;
        if (!(total > 0)) return (double.NaN, double.NaN, double.NaN);
        var below = h.UnderflowSumW / total;
        var above = h.OverflowSumW / total;
        return (below, 1 - below - above, above);
    }

    /// <summary>
    /// Refuses a binning whose bins hold less than <see cref="MinimumShare"/> of the reference (GATE2104, at the
    /// binning), and a named region a check uses that holds no reference weight (GATE2105, at the region).
    /// </summary>
    public static void Verify(FeatureSpec spec, ReferenceFeature reference)
    {
        var h = reference.Histogram;
        var (below, inside, above) = Shares(h);
        if (inside < MinimumShare)
            throw new GateInputException(ErrorCodes.ReferenceOutsideBins,
                $"The bins of feature '{spec.Name}', [{InvariantNumber.Short(h.Axis.Edges[0])}, {InvariantNumber.Short(h.Axis.Edges[^1])}), " +
                $"hold {Percent(inside)} of the reference ({Percent(below)} below the first edge, {Percent(above)} above the last); " +
                $"at least {Percent(MinimumShare)} must lie inside the bins, as the binned checks do not compare the flows. " +
                $"The reference spans [{InvariantNumber.Short(reference.Summary.Min)}, {InvariantNumber.Short(reference.Summary.Max)}]: move or widen the bins.",
                spec.Binning.Location);
        foreach (var name in spec.Checks.OfType<RegionToleranceCheck>().Where(c => c.Region.Kind == Region.Named).Select(c => c.Region.Name).Distinct())
        {
            var region = spec.Regions?.FirstOrDefault(g => g.Name == name);
            if (region is null) continue; // the contract loader refuses an undeclared region
            var (lower, upper) = NamedRegionRange.Of(h, region);
            var weight = 0.0;
            var bins = 0;
            for (var b = 0; b < h.Axis.Count; b++)
            {
                var centre = h.Axis.Centre(b);
                if (centre < lower || centre > upper) continue;
                bins++;
                weight += h.BinSumW(b);
            }
            if (!(weight > 0))
                throw new GateInputException(ErrorCodes.ReferenceRegionEmpty,
                    $"Region '{region.Name}' of feature '{spec.Name}', [{InvariantNumber.Short(lower)}, {InvariantNumber.Short(upper)}], " +
                    (bins == 0 ? "contains the centre of none of its bins" : $"holds no reference events in its {bins} bin{(bins == 1 ? "" : "s")}") +
                    $"; a check over it would compare nothing. The reference spans [{InvariantNumber.Short(reference.Summary.Min)}, {InvariantNumber.Short(reference.Summary.Max)}].",
                    region.Location);
        }
    }

    /// <summary>A share as a percentage with up to three significant digits, e.g. "0%", "12.5%".</summary>
    public static string Percent(double share) =>
        double.IsNaN(share) ? "—" : (100 * share).ToString("0.##", System.Globalization.CultureInfo.InvariantCulture) + "%";
}
