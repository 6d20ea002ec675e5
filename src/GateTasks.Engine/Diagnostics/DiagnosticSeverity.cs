namespace GateTasks.Engine.Diagnostics;

/// <summary>How a coded message weighs: an error stops or fails the run, a warning does not.</summary>
internal enum DiagnosticSeverity
{
    /// <summary>The run failed or stopped on it.</summary>
    Error,

    /// <summary>Said, but it fails nothing (an inconclusive check the contract lets warn, a ledger note).</summary>
    Warning,
}

/// <summary>The words severities are written with.</summary>
internal static class DiagnosticSeverityTokens
{
    /// <summary><c>error</c> or <c>warning</c>, as the coded line says it.</summary>
    public static string Token(this DiagnosticSeverity severity) => severity == DiagnosticSeverity.Error ? "error" : "warning";
}
