namespace GateTasks.Engine.Diagnostics;

/// <summary>
/// What a coded message is about, decided from its code in one place (<c>Diagnostic.KindOf</c>): the build
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

    /// <summary>GATE3xxx but GATE3021 and GATE3100: a check failed, the surrogate drifted outside its tolerance.</summary>
    Drift,

    /// <summary>GATE3100: the sample could not decide a check; GATE3021: a subject only goodness-of-fit tests cover, which no tolerance check decides.</summary>
    Inconclusive,

    /// <summary>GATE4010: the ratchet caught a margin worse than the accepted one.</summary>
    Ratchet,

    /// <summary>GATE4xxx but GATE4010: the acceptance ledger does not hold.</summary>
    Acceptance,
}

/// <summary>The tokens kinds are written with, and what a kind means to the build step.</summary>
/// <remarks>Dependency-free: the build step's task compiles this file too.</remarks>
internal static class DiagnosticKindTokens
{
    /// <summary>True for the kinds that say the surrogate is not (shown) faithful, rather than that the run is set up wrong.</summary>
    public static bool IsFidelity(this DiagnosticKind kind) => kind is DiagnosticKind.Drift or DiagnosticKind.Inconclusive or DiagnosticKind.Ratchet;

    /// <summary>The lower-case token a kind is written with in the build step's record stream.</summary>
    public static string Token(this DiagnosticKind kind) => kind.ToString().ToLowerInvariant();

    /// <summary>The kind a <see cref="Token"/> names; null for any other text.</summary>
    public static DiagnosticKind? FromToken(string? token)
    {
#if NET5_0_OR_GREATER
        // The generic form: it needs no run-time code generation (the tool is compiled ahead of time).
        foreach (var k in System.Enum.GetValues<DiagnosticKind>())
#else
        foreach (DiagnosticKind k in System.Enum.GetValues(typeof(DiagnosticKind)))
#endif
            if (string.Equals(k.Token(), token, System.StringComparison.Ordinal)) return k;
        return null;
    }
}
