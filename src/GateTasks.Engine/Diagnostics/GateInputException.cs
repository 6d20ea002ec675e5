namespace GateTasks.Engine.Diagnostics;

/// <summary>
/// Bad input the user can fix: a contract, sample or reference problem. Carries a stable code
/// (see <see cref="ErrorCodes"/>) and, where it applies, the place in the file.
/// Shells print it as one line; it must never surface as a stack trace.
/// </summary>
public sealed class GateInputException : Exception
{
    /// <summary>Creates the exception.</summary>
    public GateInputException(string code, string message, SourceLocation? location = null, Exception? inner = null)
        : base(message, inner)
    {
        Code = code;
        Location = location;
    }

    /// <summary>Stable error code, e.g. <c>GATE1002</c>.</summary>
    public string Code { get; }

    /// <summary>Where the problem is, when known.</summary>
    public SourceLocation? Location { get; }

    /// <summary><c>file(line,col): error CODE: message</c>.</summary>
    public string ToDiagnosticLine() => Diagnostic.From(this).Line;
}
