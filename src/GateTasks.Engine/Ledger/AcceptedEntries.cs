using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// The contract's ledger entries as a check run read them, for the reports' headroom trends: the entries, or the
/// reason there are none to show (<see cref="Absence"/>: no ledger, an empty one, or one that cannot be read — which
/// the ledger guard reports as an error of its own).
/// </summary>
internal sealed record AcceptedEntries(IReadOnlyList<LedgerEntry> Entries, string? Absence)
{
    /// <summary>For a run that did not read the ledger.</summary>
    public static readonly AcceptedEntries NotRead = new([], "the acceptance ledger was not read");

    /// <summary>Reads the ledger; never throws for a missing, empty or unreadable ledger, which it names instead.</summary>
    public static AcceptedEntries Read(PrecisionContract contract)
    {
        var path = contract.LedgerFullPath;
        if (Directory.Exists(path)) return new([], $"the acceptance ledger {path} is a directory");
        if (!File.Exists(path)) return new([], $"no acceptance ledger at {path}");
        try
        {
            var entries = LedgerFile.Read(path);
            return entries.Count == 0 ? new([], $"the acceptance ledger {path} holds no entry yet") : new(entries, null);
        }
        catch (GateInputException e)
        {
            return new([], $"the acceptance ledger {path} cannot be read ({e.Code})");
        }
    }

    /// <summary>The headroom history of the entries.</summary>
    public HeadroomHistory History => HeadroomHistory.Of(Entries);
}
