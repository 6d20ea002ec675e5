namespace GateTasks.Engine.Ledger;

/// <summary>The ledger's entries, each with what changed since the one before it.</summary>
internal static class LedgerHistory
{
    public sealed record Item(LedgerEntry Entry, LedgerEntry? Previous, bool ReferenceChanged, IReadOnlyList<StateChange> Changes);

    public static IEnumerable<Item> Of(IReadOnlyList<LedgerEntry> entries)
    {
        for (var i = 0; i < entries.Count; i++)
        {
            var previous = i > 0 ? entries[i - 1] : null;
            yield return previous is null
                ? new Item(entries[i], null, false, [])
                : new Item(entries[i], previous, previous.ReferenceSha256 != entries[i].ReferenceSha256, StateComparison.Compare(previous.State, entries[i].State));
        }
    }
}
