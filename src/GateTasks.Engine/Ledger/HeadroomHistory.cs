using GateTasks.Engine.Checks;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// The headroom of every tolerance check at each ledger entry, oldest first, from the margins and noise the entries
/// recorded (<see cref="Headroom.FromMargin"/> at each entry's own confidence). A check an entry does not hold is
/// absent there; an entry that recorded no results holds its checks without margins. At each entry a check is compared
/// with the nearest earlier entry that recorded it by the ratchet's rule (<see cref="MarginDecline"/>), unless its
/// tolerance changed in between. Goodness-of-fit tests carry no margin and are left out.
/// </summary>
internal sealed record HeadroomHistory(IReadOnlyList<LedgerEntry> Entries, IReadOnlyList<CheckHeadroomHistory> Checks)
{
    /// <summary>Whether an entry recorded check results (margins), as <c>gatetasks accept</c> does.</summary>
    public static bool RecordedResults(LedgerEntry e) => e.State.Limits.Any(l => !l.IsTest && !double.IsNaN(l.Margin));

    /// <summary>Whether any entry recorded results.</summary>
    public bool AnyRecorded => Entries.Any(RecordedResults);

    /// <summary>The subjects (features, pairs, the joint set) in the order their checks first appear.</summary>
    public IReadOnlyList<string> Subjects => Checks.Select(c => c.Subject).Distinct(StringComparer.Ordinal).ToList();

    public static HeadroomHistory Of(IReadOnlyList<LedgerEntry> entries)
    {
        var order = new List<(string Subject, string Check)>();
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var e in entries)
            foreach (var l in e.State.Limits)
                if (!l.IsTest && seen.Add(l.Id)) order.Add((l.Subject, l.Check));
        // Checks grouped by subject, each subject where its first check appeared.
        var subjects = order.Select(o => o.Subject).Distinct(StringComparer.Ordinal).ToList();
        var byEntry = entries.Select(e => e.State.Limits.Where(l => !l.IsTest).ToDictionary(l => l.Id, StringComparer.Ordinal)).ToList();
        var checks = new List<CheckHeadroomHistory>();
        foreach (var subject in subjects)
            foreach (var (s, check) in order.Where(o => o.Subject == subject))
            {
                var id = $"{s} {check}";
                var at = new List<EntryHeadroom>();
                EntryHeadroom? previous = null;
                for (var k = 0; k < entries.Count; k++)
                {
                    var e = entries[k];
                    if (!byEntry[k].TryGetValue(id, out var limit))
                    {
                        at.Add(new(e, HeadroomPresence.Absent, null, new(double.NaN, double.NaN), null, null));
                        continue;
                    }
                    if (double.IsNaN(limit.Margin))
                    {
                        at.Add(new(e, HeadroomPresence.NotRecorded, limit, new(double.NaN, double.NaN), null, null));
                        continue;
                    }
                    var confidence = e.State.Confidence;
                    var headroom = Headroom.FromMargin(new Margin(limit.Margin, limit.Noise), confidence);
                    MarginDecline? since = null;
                    if (previous is { Limit: { } before } && before.Tolerance == limit.Tolerance)
                        since = Compare(before, previous.Entry.State.Confidence, new Margin(limit.Margin, limit.Noise), confidence);
                    var here = new EntryHeadroom(e, HeadroomPresence.Recorded, limit, headroom, since, since is null ? null : previous!.Entry.Number);
                    at.Add(here);
                    previous = here;
                }
                checks.Add(new CheckHeadroomHistory(s, check, at));
            }
        return new HeadroomHistory(entries, checks);
    }

    /// <summary>
    /// The ratchet's comparison of a margin measured now (at <paramref name="confidenceNow"/>) with the one an entry
    /// recorded for <paramref name="then"/>; null when the confidence of either is unusable or a noise is unknown.
    /// </summary>
    public static MarginDecline? Compare(AcceptedLimit then, double confidenceThen, Margin now, double confidenceNow)
    {
        if (!(confidenceThen > 0.5 && confidenceThen < 1) || !(confidenceNow > 0.5 && confidenceNow < 1)) return null;
        return MarginDecline.Compare(then.Margin, then.Noise, Normal.InvCDF(0, 1, confidenceThen), now.Value, now.Noise, Normal.InvCDF(0, 1, confidenceNow));
    }

    /// <summary>
    /// A check measured now against its history: the latest entry that recorded it, and the ratchet's comparison with
    /// it (null when the check has no recorded margin, or its tolerance changed since).
    /// </summary>
    public (EntryHeadroom? Then, MarginDecline? Decline) SinceLatest(string id, Margin now, double toleranceNow, double confidenceNow)
    {
        var then = Checks.FirstOrDefault(c => c.Id == id)?.LatestRecorded;
        if (then?.Limit is not { } limit || limit.Tolerance != toleranceNow) return (then, null);
        return (then, Compare(limit, then.Entry.State.Confidence, now, confidenceNow));
    }
}
