using System.Globalization;
using GateTasks.Engine.Checks;

namespace GateTasks.Engine.Reports;

/// <summary>
/// A check's <see cref="Headroom"/> in words and in a table cell, the one wording every report uses: "uses 64% of its
/// tolerance (estimate 50%)". Shares are whole percentages (one format throughout); above 1000% the figure is
/// written "&gt;1000%", since a check that far outside its tolerance needs no finer reading.
/// </summary>
internal static class HeadroomText
{
    /// <summary>"uses 64% of its tolerance (estimate 50%)"; without a point share (a test) the first half alone; "headroom not measured" when the measurement could not be made.</summary>
    public static string Of(Headroom h)
    {
        if (!h.IsMeasured) return "headroom not measured";
        var text = $"uses {Percent(h.UpperShare)} of its tolerance";
        return double.IsFinite(h.PointShare) ? text + $" (estimate {Percent(h.PointShare)})" : text;
    }

    /// <summary>The table cell: "64% (50%)", "64%" without a point share, "—" unmeasured.</summary>
    public static string Cell(Headroom h) =>
        !h.IsMeasured ? "—" : double.IsFinite(h.PointShare) ? $"{Percent(h.UpperShare)} ({Percent(h.PointShare)})" : Percent(h.UpperShare);

    /// <summary>A share as a whole percentage: 0.643 → "64%"; "&gt;1000%" beyond ten times the tolerance.</summary>
    public static string Percent(double share) =>
        double.IsNaN(share) ? "—"
        : share > 10 ? ">1000%"
        : (share * 100).ToString("0", CultureInfo.InvariantCulture) + "%";
}
