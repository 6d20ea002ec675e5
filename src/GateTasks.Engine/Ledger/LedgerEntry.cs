namespace GateTasks.Engine.Ledger;

/// <summary>
/// One accepted state of a contract: who accepted it, when (UTC) and why; the SHA-256 of the contract, the reference
/// and the check results that justified it; the state itself; and the seal of the entry before it (<see cref="After"/>)
/// and its own (<see cref="Seal"/>), which chain the entries. <see cref="Line"/> is where it starts in the ledger,
/// <see cref="LastLine"/> its <c>seal</c> line.
/// </summary>
internal sealed record LedgerEntry(
    int Number,
    DateTimeOffset When,
    string By,
    string Why,
    string ContractSha256,
    string ContractFile,
    string ReferenceSha256,
    string ReferenceFile,
    string ResultsSha256,
    string ResultsNote,
    AcceptedState State,
    string After,
    string Seal,
    int Line = 0,
    int LastLine = 0);
