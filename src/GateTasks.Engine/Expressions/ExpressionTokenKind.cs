namespace GateTasks.Engine.Expressions;

/// <summary>The kinds of token an expression is made of.</summary>
internal enum ExpressionTokenKind
{
    Number,
    Identifier,
    QuotedIdentifier,
    Plus,
    Minus,
    Star,
    Slash,
    Percent,
    Caret,
    LeftParenthesis,
    RightParenthesis,
    Comma,
    Less,
    LessOrEqual,
    Greater,
    GreaterOrEqual,
    Equal,
    NotEqual,
    /// <summary><c>and</c> or <c>&amp;&amp;</c>.</summary>
    And,
    /// <summary><c>or</c> or <c>||</c>.</summary>
    Or,
    /// <summary><c>not</c> or <c>!</c>.</summary>
    Not,
    End,
}
