using System.Globalization;
using System.Text;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ledger;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The headroom history as plain text for <c>gatetasks history</c>: per subject a table with one row per check and one
/// column per ledger entry, oldest first, each cell "upper share / point share" (upper bound and estimate over the
/// tolerance), or why there is no figure: the entry did not hold the check (<c>absent</c>) or recorded no results
/// (<c>no results</c>). A cell marked <c>!</c> is worse than the nearest earlier entry that recorded the check, by more
/// than its noise allows (the ratchet's rule, <see cref="MarginDecline"/>).
/// </summary>
internal static class HeadroomHistoryText
{
    public const string WorseMark = "!";

    /// <summary>
    /// Renders the history, optionally only the checks of <paramref name="subject"/> and only checks that worsened beyond
    /// their noise at some entry (<paramref name="worsenedOnly"/>).
    /// </summary>
    public static string Render(HeadroomHistory history, string? subject = null, bool worsenedOnly = false)
    {
        var sb = new StringBuilder();
        sb.Append("Headroom at each entry, oldest first: upper bound / tolerance and estimate / tolerance (1 = the tolerance's edge).\n");
        var unrecorded = history.Entries.Where(e => !HeadroomHistory.RecordedResults(e)).Select(e => "#" + Count(e.Number)).ToList();
        if (unrecorded.Count == history.Entries.Count)
            return sb.Append("No entry recorded check results (margins), so there is no headroom to show.\n").ToString();
        if (unrecorded.Count > 0)
            sb.Append($"Entries that recorded no check results: {string.Join(", ", unrecorded)} ('no results').\n");
        sb.Append($"'{WorseMark}' marks a check whose estimate / tolerance rose since the entry before it that recorded it by more than its noise allows (the ratchet's rule).\n");
        var checks = history.Checks.Where(c => (subject is null || c.Subject == subject) && (!worsenedOnly || c.EverWorsened)).ToList();
        if (checks.Count == 0)
            return sb.Append(worsenedOnly
                ? $"No check{(subject is null ? "" : $" of {subject}")} got worse beyond its noise at any entry.\n"
                : $"No tolerance check of {subject} in any entry.\n").ToString();
        var headers = history.Entries.Select(e => "#" + Count(e.Number) + " " + e.When.UtcDateTime.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture)).ToList();
        foreach (var group in checks.GroupBy(c => c.Subject))
        {
            var rows = group.Select(c => (Label: "  " + c.Check, Cells: c.AtEntries.Select(Cell).ToList())).ToList();
            var first = Math.Max(group.Key.Length, rows.Max(r => r.Label.Length));
            var widths = headers.Select((h, k) => Math.Max(h.Length, rows.Max(r => r.Cells[k].Length))).ToList();
            sb.Append('\n').Append(group.Key.PadRight(first));
            for (var k = 0; k < headers.Count; k++) sb.Append("  ").Append(headers[k].PadRight(widths[k]));
            sb.Length = TrimEnd(sb);
            sb.Append('\n');
            foreach (var (label, cells) in rows)
            {
                sb.Append(label.PadRight(first));
                for (var k = 0; k < cells.Count; k++) sb.Append("  ").Append(cells[k].PadRight(widths[k]));
                sb.Length = TrimEnd(sb);
                sb.Append('\n');
            }
        }
        return sb.ToString();
    }

    /// <summary>One cell: "0.62 / 0.41", with the worse mark, or why there is no figure.</summary>
    public static string Cell(EntryHeadroom e) => e.Presence switch
    {
        HeadroomPresence.Absent => "absent",
        HeadroomPresence.NotRecorded => "no results",
        _ => $"{Share(e.Headroom.UpperShare)} / {Share(e.Headroom.PointShare)}{(e.Worsened ? " " + WorseMark : "")}",
    };

    /// <summary>A share with two decimals (shares sit near 0–1), or a word for what is not a number.</summary>
    public static string Share(double x) =>
        double.IsNaN(x) ? "—" : double.IsInfinity(x) ? InvariantNumber.Short(x) : x.ToString("0.00", CultureInfo.InvariantCulture);

    private static string Count(int n) => n.ToString(CultureInfo.InvariantCulture);

    private static int TrimEnd(StringBuilder sb)
    {
        var n = sb.Length;
        while (n > 0 && sb[n - 1] == ' ') n--;
        return n;
    }
}
