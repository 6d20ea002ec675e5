namespace GateTasks.Engine.Diagnostics;

/// <summary>
/// One coded message of a run: an input error, a failed or inconclusive check, a ledger finding. The console shows it
/// as <see cref="Line"/>; the build step reads it from the record stream (<see cref="RunRecord"/>), never from text.
/// </summary>
/// <param name="Code">Stable code from <see cref="ErrorCodes"/>, e.g. <c>GATE3001</c>.</param>
/// <param name="Severity">Whether it is an error or a warning.</param>
/// <param name="Location">Where it is (file, line, column), when known.</param>
/// <param name="Text">What it says.</param>
internal sealed record Diagnostic(string Code, DiagnosticSeverity Severity, SourceLocation? Location, string Text)
{
    /// <summary>What it is about, from its code.</summary>
    public DiagnosticKind Kind => KindOf(Code);

    /// <summary>The one rule from a code (<c>GATE</c> and four digits) to its kind; <see cref="DiagnosticKind.Setup"/> for any other text.</summary>
    public static DiagnosticKind KindOf(string code)
    {
        if (code.Length != 8 || !code.StartsWith("GATE", StringComparison.Ordinal)) return DiagnosticKind.Setup;
        // A subject that only goodness-of-fit tests cover is undecided, as an inconclusive check is: not a drift.
        if (code is ErrorCodes.Inconclusive or ErrorCodes.SubjectWithoutTolerance) return DiagnosticKind.Inconclusive;
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

    /// <summary>An error.</summary>
    public static Diagnostic Error(string code, string text, SourceLocation? location = null) => new(code, DiagnosticSeverity.Error, location, text);

    /// <summary>The error an input problem is shown as.</summary>
    public static Diagnostic From(GateInputException e) => Error(e.Code, e.Message, e.Location);

    /// <summary><c>file(line,col): error CODE: text</c>, from the one formatter.</summary>
    public string Line => DiagnosticLine.Format(Location?.File, Location?.Line ?? 0, Location?.Column ?? 0, Severity.Token(), Code, Text);

    /// <summary>The record the build step reads.</summary>
    public RunRecord ToRecord() => new(RunRecord.DiagnosticType)
    {
        Code = Code,
        Severity = Severity.Token(),
        Kind = Kind.Token(),
        File = Location?.File,
        Line = Location?.Line ?? 0,
        Column = Location?.Column ?? 0,
        Text = Text,
    };
}
