using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// How the contract's accepted state is guarded. <see cref="LedgerPath"/> is the acceptance ledger (relative to the
/// contract); with <see cref="Required"/> a missing ledger is an error, else a warning. With
/// <see cref="RecordTightening"/> a tightened tolerance needs an entry too (by default only loosening does). With
/// <see cref="Ratchet"/> a check whose margin fell below the last accepted one by more than its noise fails.
/// </summary>
internal sealed record AcceptanceSettings(string LedgerPath, bool Required, bool RecordTightening, bool Ratchet, SourceLocation? Location,
    SourceLocation? LedgerLocation = null)
{
    /// <summary>The ledger's default name: the contract's file name with <c>.ledger</c> for its extension.</summary>
    public static string DefaultLedgerName(string contractPath) => Path.GetFileNameWithoutExtension(contractPath) + ".ledger";

    /// <summary>Defaults for a contract without an acceptance block.</summary>
    public static AcceptanceSettings Default(string contractPath) => new(DefaultLedgerName(contractPath), false, false, false, null);
}
