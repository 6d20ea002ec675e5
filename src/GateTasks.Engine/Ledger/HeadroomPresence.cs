namespace GateTasks.Engine.Ledger;

/// <summary>What a ledger entry holds of one check's headroom.</summary>
internal enum HeadroomPresence
{
    /// <summary>The check was not in the contract at that entry (added later or removed before).</summary>
    Absent,

    /// <summary>The check was accepted, but the entry recorded no results (no margin).</summary>
    NotRecorded,

    /// <summary>The entry recorded the check's margin and noise.</summary>
    Recorded,
}
