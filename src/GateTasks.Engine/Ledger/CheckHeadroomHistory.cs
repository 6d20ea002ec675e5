namespace GateTasks.Engine.Ledger;

/// <summary>One check (subject and label) across the ledger's entries, oldest first: one <see cref="EntryHeadroom"/> per entry.</summary>
internal sealed record CheckHeadroomHistory(string Subject, string Check, IReadOnlyList<EntryHeadroom> AtEntries)
{
    /// <summary>Identity of the check across versions of the contract, as <see cref="AcceptedLimit.Id"/>.</summary>
    public string Id => $"{Subject} {Check}";

    /// <summary>Whether at some entry its point margin fell by more than its noise allows since an earlier one.</summary>
    public bool EverWorsened => AtEntries.Any(e => e.Worsened);

    /// <summary>The latest entry that recorded this check's margin, or null.</summary>
    public EntryHeadroom? LatestRecorded => AtEntries.LastOrDefault(e => e.Presence == HeadroomPresence.Recorded);
}
