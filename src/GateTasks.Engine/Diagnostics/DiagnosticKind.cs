namespace GateTasks.Engine.Diagnostics;

/// <summary>
/// What a coded message is about, decided from its code in one place (<see cref="DiagnosticKinds.Of"/>): the build
/// step shows fidelity failures (drift, inconclusive, ratchet) as warnings in warn-only mode, and everything else as
/// it is.
/// </summary>
internal enum DiagnosticKind
{
    /// <summary>GATE0xxx: usage, outputs, the engine itself.</summary>
    Setup,

    /// <summary>GATE1xxx: the contract.</summary>
    Contract,

    /// <summary>GATE2xxx: a sample, a reference or a partial file.</summary>
    Sample,

    /// <summary>GATE3xxx but GATE3100: a check failed, the surrogate drifted outside its tolerance.</summary>
    Drift,

    /// <summary>GATE3100: the sample could not decide a check.</summary>
    Inconclusive,

    /// <summary>GATE4010: the ratchet caught a margin worse than the accepted one.</summary>
    Ratchet,

    /// <summary>GATE4xxx but GATE4010: the acceptance ledger does not hold.</summary>
    Acceptance,
}

/// <summary>The one rule from a code to its kind, and the tokens kinds and severities are written with.</summary>
internal static class DiagnosticKinds
{
    /// <summary>The kind of <paramref name="code"/> (<c>GATE</c> and four digits); <see cref="DiagnosticKind.Setup"/> for any other text.</summary>
    public static DiagnosticKind Of(string code)
    {
        if (code.Length != 8 || !code.StartsWith("GATE", System.StringComparison.Ordinal)) return DiagnosticKind.Setup;
        if (code == ErrorCodes.Inconclusive) return DiagnosticKind.Inconclusive;
        if (code == ErrorCodes.RatchetDegraded) return DiagnosticKind.Ratchet;
        return code[4] switch
        {
            '1' => DiagnosticKind.Contract,
            '2' => DiagnosticKind.Sample,
            '3' => DiagnosticKind.Drift,
            '4' => DiagnosticKind.Acceptance,
            _ => DiagnosticKind.Setup,
        };
    }

    /// <summary>True for the kinds that say the surrogate is not (shown) faithful, rather than that the run is set up wrong.</summary>
    public static bool IsFidelity(this DiagnosticKind kind) => kind is DiagnosticKind.Drift or DiagnosticKind.Inconclusive or DiagnosticKind.Ratchet;

    /// <summary>The lower-case token a kind is written with in the build step's record stream.</summary>
    public static string Token(this DiagnosticKind kind) => kind.ToString().ToLowerInvariant();

    /// <summary><c>error</c> or <c>warning</c>, as the coded line says it.</summary>
    public static string Token(this DiagnosticSeverity severity) => severity == DiagnosticSeverity.Error ? "error" : "warning";
}
