namespace GateTasks.Engine.Expressions;

/// <summary>The kinds of token an expression is made of.</summary>
internal enum ExpressionTokenKind
{
    Number,
    Identifier,
    /// <summary>A column name written in braces, <c>{jet pt}</c>.</summary>
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
    /// <summary><c>&amp;&amp;</c>.</summary>
    And,
    /// <summary><c>||</c>.</summary>
    Or,
    /// <summary><c>!</c>.</summary>
    Not,
    End,
}
