using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The band 1 ± tolerance that a ratio-max check allows over the bins of its region, as contiguous value spans
/// (the tails are two spans, a named region usually one).
/// </summary>
internal sealed record ToleranceBand(string Region, Region Kind, double Tolerance, IReadOnlyList<(double Lower, double Upper)> Spans, Verdict Verdict)
{
    /// <summary>The bands of every ratio-max check of one feature, in contract order.</summary>
    public static IReadOnlyList<ToleranceBand> For(FeatureComparison c, IEnumerable<CheckOutcome> outcomes)
    {
        var axis = c.Reference.Histogram.Axis;
        var bands = new List<ToleranceBand>();
        foreach (var o in outcomes)
        {
            if (o.Check is not RegionToleranceCheck { Kind: CheckKind.BinRatio } check) continue;
            var covered = RegionBins.Covered(c, check);
            var spans = new List<(double, double)>();
            for (var b = 0; b < covered.Length; b++)
            {
                if (!covered[b]) continue;
                var first = b;
                while (b + 1 < covered.Length && covered[b + 1]) b++;
                spans.Add((axis.Lower(first), axis.Upper(b)));
            }
            bands.Add(new ToleranceBand(check.RegionName, check.Region.Kind, check.Tolerance, spans, o.Verdict));
        }
        return bands;
    }
}
