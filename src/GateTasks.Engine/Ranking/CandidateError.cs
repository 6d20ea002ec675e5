using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ranking;

/// <summary>Why a candidate could not be checked (an unreadable or empty sample, a missing column).</summary>
internal sealed record CandidateError(string Code, string Message, SourceLocation? Location)
{
    public static CandidateError From(GateInputException e) => new(e.Code, e.Message, e.Location);

    /// <summary><c>file(line,col): error CODE: message</c>, as the check command prints it.</summary>
    public string DiagnosticLine => Diagnostic.Error(Code, Message, Location).Line;
}
