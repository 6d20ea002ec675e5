using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Expressions;

/// <summary>
/// The text of one expression and where it starts in the contract; turns an offset into the text into a
/// located error, so the caret lands on the offending token.
/// </summary>
internal sealed class ExpressionSource(string text, SourceLocation location)
{
    /// <summary>The expression as written.</summary>
    public string Text { get; } = text;

    /// <summary>Where <see cref="Text"/> starts in the contract.</summary>
    public SourceLocation Location { get; } = location;

    /// <summary>
    /// An error at <paramref name="offset"/> (0-based, into the text), <see cref="ErrorCodes.ContractExpression"/>
    /// unless <paramref name="code"/> says otherwise. Expressions are single-line, so the position is the start column
    /// plus the offset on the same line; an unknown start column (0) stays unknown rather than pretending to be column 1.
    /// </summary>
    public GateInputException Error(int offset, string message, string code = ErrorCodes.ContractExpression)
    {
        var at = Location.Column > 0 ? Location with { Column = Location.Column + offset } : Location;
        return new GateInputException(code, message, at);
    }
}
