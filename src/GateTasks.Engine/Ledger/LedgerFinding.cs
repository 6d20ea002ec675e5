using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>One thing the ledger check found: an error (the build fails) or a warning, with its code and place.</summary>
internal sealed record LedgerFinding(string Code, bool IsError, string Message, SourceLocation? Location);
