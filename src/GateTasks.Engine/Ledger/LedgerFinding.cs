using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>One thing the ledger check found: an error (the build fails) or a warning, with its code and place.</summary>
internal sealed record LedgerFinding(string Code, bool IsError, string Message, SourceLocation? Location)
{
    /// <summary>The finding as a coded message.</summary>
    public Diagnostic Diagnostic => new(Code, IsError ? DiagnosticSeverity.Error : DiagnosticSeverity.Warning, Location, Message);
}
