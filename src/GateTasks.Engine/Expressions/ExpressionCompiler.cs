using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Expressions;

/// <summary>
/// Compiles the expressions of a contract (derived features, selections) into <see cref="CompiledExpression"/>s.
/// The language is deliberately small and closed: numbers, column names, <c>pi</c>, arithmetic, comparisons,
/// logic and a fixed list of functions (<see cref="ExpressionFunction.All"/>). No strings, member access,
/// assignment or anything outside the given columns; length and nesting are bounded.
/// </summary>
internal static class ExpressionCompiler
{
    /// <summary>Longest accepted expression, in characters.</summary>
    public const int MaxLength = 10_000;

    /// <summary>Deepest accepted nesting of parentheses, calls, prefix operators and exponents.</summary>
    public const int MaxDepth = 64;

    /// <summary>
    /// Parses and checks <paramref name="text"/> against the columns that exist. Every problem is a
    /// <see cref="GateInputException"/> with code <see cref="ErrorCodes.ContractExpression"/> located at the
    /// offending token: <paramref name="location"/>.Column plus the token's offset into the text.
    /// </summary>
    public static CompiledExpression Compile(string text, IReadOnlyCollection<string> available, SourceLocation location)
    {
        ArgumentNullException.ThrowIfNull(text);
        ArgumentNullException.ThrowIfNull(available);
        ArgumentNullException.ThrowIfNull(location);
        var source = new ExpressionSource(text, location);
        if (text.Length > MaxLength)
            throw source.Error(0, $"expression too long: {text.Length} characters, the limit is {MaxLength}");
        var tokens = ExpressionLexer.Tokenize(source);
        var (program, columns) = new ExpressionParser(source, tokens, available).Parse();
        return new CompiledExpression(text, program, columns);
    }
}
