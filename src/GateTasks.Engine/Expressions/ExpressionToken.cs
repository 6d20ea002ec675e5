namespace GateTasks.Engine.Expressions;

/// <summary>
/// One token: its kind, where it is in the text, its spelling (for a braced name, the name inside the braces)
/// and, for a number, its value.
/// </summary>
internal readonly record struct ExpressionToken(ExpressionTokenKind Kind, int Offset, string Text, double Number = 0)
{
    /// <summary>How an error message names this token.</summary>
    public string Describe() => Kind switch
    {
        ExpressionTokenKind.End => "the end of the expression",
        ExpressionTokenKind.QuotedIdentifier => $"{{{Text}}}",
        _ => $"'{Text}'",
    };
}
