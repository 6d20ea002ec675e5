using GateTasks.Engine.Ledger;
using GateTasks.Engine.Reports;

namespace GateTasks.Engine.Tests.Ledger;

/// <summary>
/// The headroom history of constructed ledger entries: shares from recorded margins, absent checks, an entry without
/// results, and the ratchet's rule between entries, on numbers worked by hand.
/// </summary>
public sealed class HeadroomHistoryTests
{
    // Φ⁻¹(0.95) = 1.644854 (standard normal table; e.g. Abramowitz & Stegun 1964, table 26.5).
    private const double Z95 = 1.644854;

    private static readonly KeyValuePair<string, string>[] Decision =
        [new("confidence", "0.95"), new("false-alarm", "0.01"), new("correction", "holm"), new("inconclusive", "fail")];

    private static LedgerEntry Entry(int number, params AcceptedLimit[] limits) =>
        new(number, new DateTimeOffset(2026, 12, number, 9, 0, 0, TimeSpan.Zero), "Ada", "why", "c", "c.yaml", "r", "r.parquet", "s", "note",
            new AcceptedState(Decision, null, [], limits), "a", "s");

    private static AcceptedLimit Limit(string check, double tolerance, double margin, double noise) => new("x", check, tolerance, margin, noise, null);

    [Fact]
    public void Shares_come_from_the_recorded_margin_and_noise_and_gaps_say_why()
    {
        var entries = new[]
        {
            Entry(1, Limit("mean-shift-max", 0.05, 0.5, 0.1), Limit("ks-max", 0.03, 0.4, 0.05), new AcceptedLimit("x", "chi2-test", double.NaN, double.NaN, double.NaN, null)),
            Entry(2, Limit("mean-shift-max", 0.05, double.NaN, double.NaN), Limit("ks-max", 0.03, double.NaN, double.NaN)),
            Entry(3, Limit("mean-shift-max", 0.05, 0.1, 0.1), Limit("width-ratio-max", 0.05, 0.7, 0.02)),
        };
        var history = HeadroomHistory.Of(entries);
        // Goodness-of-fit tests carry no margin: they have no headroom row.
        Assert.Equal(["x mean-shift-max", "x ks-max", "x width-ratio-max"], history.Checks.Select(c => c.Id));
        Assert.False(HeadroomHistory.RecordedResults(entries[1]));
        Assert.True(HeadroomHistory.RecordedResults(entries[0]));

        var shift = history.Checks[0].AtEntries;
        // By hand: upper share = 1 − margin = 0.5; point share = upper − z·noise = 0.5 − 1.644854·0.1 = 0.3355146.
        Assert.Equal(0.5, shift[0].Headroom.UpperShare, 12);
        Assert.Equal(0.5 - Z95 * 0.1, shift[0].Headroom.PointShare, 6);
        Assert.Equal(HeadroomPresence.NotRecorded, shift[1].Presence);
        Assert.True(double.IsNaN(shift[1].Headroom.UpperShare));
        // Entry 3 against entry 1 (entry 2 recorded nothing): point margins 0.5 + 0.1645 = 0.6645 and 0.1 + 0.1645 =
        // 0.2645; the fall of 0.4 exceeds z·√(0.1² + 0.1²) = 0.2326, by hand.
        Assert.Equal(1, shift[2].SinceEntry);
        Assert.Equal(0.5 + Z95 * 0.1, shift[2].Since!.Value.PointThen, 6);
        Assert.Equal(0.1 + Z95 * 0.1, shift[2].Since!.Value.PointNow, 6);
        Assert.Equal(Z95 * Math.Sqrt(0.02), shift[2].Since!.Value.Allowed, 6);
        Assert.True(shift[2].Worsened);
        Assert.True(history.Checks[0].EverWorsened);

        var ks = history.Checks[1].AtEntries;
        Assert.Equal([HeadroomPresence.Recorded, HeadroomPresence.NotRecorded, HeadroomPresence.Absent], ks.Select(e => e.Presence));
        var width = history.Checks[2].AtEntries;
        Assert.Equal([HeadroomPresence.Absent, HeadroomPresence.Absent, HeadroomPresence.Recorded], width.Select(e => e.Presence));
        Assert.False(history.Checks[2].EverWorsened);
    }

    [Fact]
    public void A_fall_within_the_noise_or_across_a_changed_tolerance_is_not_flagged()
    {
        // Point margins 0.6645 then 0.5145: a fall of 0.15, inside the allowance 0.2326 (by hand).
        var within = HeadroomHistory.Of([Entry(1, Limit("mean-shift-max", 0.05, 0.5, 0.1)), Entry(2, Limit("mean-shift-max", 0.05, 0.35, 0.1))]);
        var second = within.Checks[0].AtEntries[1];
        Assert.NotNull(second.Since);
        Assert.False(second.Worsened);

        // The same fall as above with the tolerance changed in between: the ratchet compares no such pair (docs/ledger.md).
        var changed = HeadroomHistory.Of([Entry(1, Limit("mean-shift-max", 0.05, 0.5, 0.1)), Entry(2, Limit("mean-shift-max", 0.04, 0.1, 0.1))]);
        Assert.Null(changed.Checks[0].AtEntries[1].Since);
        Assert.False(changed.Checks[0].EverWorsened);
    }

    [Fact]
    public void The_text_table_has_a_column_per_entry_and_says_absent_and_no_results()
    {
        var history = HeadroomHistory.Of([
            Entry(1, Limit("mean-shift-max", 0.05, 0.5, 0.1), Limit("ks-max", 0.03, 0.4, 0.05)),
            Entry(2, Limit("mean-shift-max", 0.05, double.NaN, double.NaN), Limit("ks-max", 0.03, double.NaN, double.NaN)),
            Entry(3, Limit("mean-shift-max", 0.05, 0.1, 0.1)),
        ]);
        var text = HeadroomHistoryText.Render(history);
        var lines = text.Split('\n');
        Assert.Contains("Entries that recorded no check results: #2 ('no results').", lines);
        // Compares the program with itself: the shares worked by hand above, printed with two decimals.
        Assert.Contains(lines, l => l.StartsWith("x ", StringComparison.Ordinal) && l.Contains("#1 2026-12-01") && l.Contains("#3 2026-12-03"));
        var shiftRow = Assert.Single(lines, l => l.TrimStart().StartsWith("mean-shift-max", StringComparison.Ordinal));
        Assert.Matches(@"mean-shift-max\s+0\.50 / 0\.34\s+no results\s+0\.90 / 0\.74 !$", shiftRow);
        var ksRow = Assert.Single(lines, l => l.TrimStart().StartsWith("ks-max", StringComparison.Ordinal));
        // 1 − 0.4 = 0.60; 0.6 − 1.644854·0.05 = 0.5178.
        Assert.Matches(@"ks-max\s+0\.60 / 0\.52\s+no results\s+absent$", ksRow);

        var worse = HeadroomHistoryText.Render(history, worsenedOnly: true);
        Assert.Contains("mean-shift-max", worse);
        Assert.DoesNotContain("ks-max", worse);
    }
}
