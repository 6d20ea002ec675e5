using GateTasks.Engine.Checks;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// One check at one ledger entry: whether the entry holds it and its margin, the headroom that margin gives (NaN
/// shares unless <see cref="Presence"/> is <see cref="HeadroomPresence.Recorded"/>), and — when an earlier entry
/// recorded the same check with the same tolerance — the ratchet's comparison with the nearest such entry
/// (<see cref="Since"/>, numbered <see cref="SinceEntry"/>).
/// </summary>
internal sealed record EntryHeadroom(LedgerEntry Entry, HeadroomPresence Presence, AcceptedLimit? Limit, Headroom Headroom, MarginDecline? Since, int? SinceEntry)
{
    /// <summary>Whether the point margin fell since the earlier entry by more than its noise allows.</summary>
    public bool Worsened => Since is { IsBeyondNoise: true };
}
