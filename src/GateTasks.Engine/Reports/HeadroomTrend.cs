using System.Globalization;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Ledger;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The headroom of one subject's checks across the ledger's entries and the current run: one column per entry (oldest
/// first) and a last one for this run, one line per check with its upper share (upper bound / tolerance) in each
/// column — NaN where the entry did not hold the check or recorded no results. A check the contract no longer holds
/// keeps its line without a point for this run.
/// </summary>
internal sealed record HeadroomTrend(string Subject, IReadOnlyList<string> Columns, IReadOnlyList<HeadroomTrend.Line> Lines)
{
    /// <summary>One check's upper shares, one per column, and the ratchet's comparison of this run with its latest recorded entry.</summary>
    public sealed record Line(string Check, IReadOnlyList<double> UpperShares, EntryHeadroom? Then, MarginDecline? SinceThen)
    {
        /// <summary>Whether this run's point margin fell below the latest recorded one by more than the noise allows.</summary>
        public bool Worsened => SinceThen is { IsBeyondNoise: true };
    }

    /// <summary>The label of this run's column.</summary>
    public const string NowLabel = "this run";

    /// <summary>The trend of one subject of a run, from the ledger entries the run read.</summary>
    public static HeadroomTrend For(RunResult report, HeadroomHistory history, string subject)
    {
        var columns = history.Entries.Select(EntryLabel).Append(NowLabel).ToList();
        var decision = report.Contract.Decision;
        var lines = new List<Line>();
        var now = report.Outcomes.Where(o => o.Subject.Name == subject).ToList();
        var past = history.Checks.Where(c => c.Subject == subject).ToDictionary(c => c.Check, StringComparer.Ordinal);
        foreach (var o in now)
        {
            var shares = past.TryGetValue(o.Check.Label, out var h) ? h.AtEntries.Select(e => e.Headroom.UpperShare).ToList() : history.Entries.Select(_ => double.NaN).ToList();
            shares.Add(Headroom.Of(o, decision).UpperShare);
            var tolerance = o.Check is ToleranceCheck t ? t.Tolerance : double.NaN;
            var (then, decline) = history.SinceLatest($"{subject} {o.Check.Label}", Margin.Of(o, decision), tolerance, decision.Confidence);
            lines.Add(new Line(o.Check.Label, shares, then, decline));
        }
        // Checks accepted once and no longer in the contract: their past, without a point now.
        foreach (var (label, h) in past)
            if (!now.Any(o => o.Check.Label == label))
                lines.Add(new Line(label, h.AtEntries.Select(e => e.Headroom.UpperShare).Append(double.NaN).ToList(), h.LatestRecorded, null));
        return new HeadroomTrend(subject, columns, lines);
    }

    /// <summary>
    /// One sentence per subject with a check whose point margin fell, since the latest entry that recorded it, by more
    /// than its noise allows (the ratchet's rule, whether or not the contract turns the ratchet on), in contract order.
    /// </summary>
    public static IReadOnlyList<string> WorsenedSentences(RunResult report)
    {
        if (report.LedgerEntries.Entries.Count == 0) return [];
        var history = report.LedgerEntries.History;
        var sentences = new List<string>();
        foreach (var subject in report.Outcomes.Select(o => o.Subject.Name).Distinct(StringComparer.Ordinal))
        {
            var trend = For(report, history, subject);
            var worse = trend.Lines.Where(l => l.Worsened).ToList();
            if (worse.Count == 0) continue;
            // The check that lost the most point margin names the trend; the others are counted.
            var worst = worse.OrderByDescending(l => l.SinceThen!.Value.PointThen - l.SinceThen.Value.PointNow).First();
            var d = worst.SinceThen!.Value;
            sentences.Add($"{subject}: headroom worse than at the latest accepted entry, beyond noise, in {worse.Count} of {trend.Lines.Count} check{(trend.Lines.Count == 1 ? "" : "s")}; " +
                $"most in {worst.Check}, estimate / tolerance {Num(1 - d.PointThen)} at entry {worst.Then!.Entry.Number} → {Num(1 - d.PointNow)} now");
        }
        return sentences;
    }

    private static string Num(double v) => double.IsFinite(v) ? v.ToString("0.00", CultureInfo.InvariantCulture) : "inf";

    /// <summary>An entry's column label: its number and UTC date.</summary>
    public static string EntryLabel(LedgerEntry e) =>
        "#" + e.Number.ToString(CultureInfo.InvariantCulture) + " " + e.When.UtcDateTime.ToString("yyyy-MM-dd", CultureInfo.InvariantCulture);
}
