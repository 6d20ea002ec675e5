using GateTasks.Engine.Diagnostics;
using System.Globalization;

namespace GateTasks.Engine.Expressions;

/// <summary>
/// Splits expression text into tokens. Only ASCII is accepted outside braces, so a lookalike character
/// (a Unicode minus sign, a Cyrillic letter) is reported where it is instead of silently meaning something else.
/// A column name that is not an identifier is written in braces, <c>{jet pt}</c>; logic is written with the
/// operators <c>&amp;&amp;</c>, <c>||</c> and <c>!</c>. The words <c>and</c>, <c>or</c>, <c>not</c> and backquoted
/// names are refused with what to write instead (GATE1017, GATE1018) rather than read as columns.
/// </summary>
internal static class ExpressionLexer
{
    // Characters people paste from documents; the hint names the ASCII spelling meant.
    private static readonly Dictionary<int, string> Lookalikes = new()
    {
        [0x2212] = "-", [0x2010] = "-", [0x2011] = "-", [0x2012] = "-", [0x2013] = "-", [0x2014] = "-",
        [0x00D7] = "*", [0x22C5] = "*", [0x00B7] = "*", [0x2217] = "*", [0x00F7] = "/", [0x2215] = "/",
        [0x2264] = "<=", [0x2265] = ">=", [0x2260] = "!=", [0x2227] = "&&", [0x2228] = "||", [0x00AC] = "!",
        [0x00A0] = "a plain space", [0x2009] = "a plain space", [0x202F] = "a plain space",
        [0x2018] = "{name} (braces)", [0x2019] = "{name} (braces)",
        [0x201C] = "{name} (braces)", [0x201D] = "{name} (braces)",
        [0x03C0] = "pi",
    };

    /// <summary>The tokens of <paramref name="source"/>, ending with one <see cref="ExpressionTokenKind.End"/>.</summary>
    public static List<ExpressionToken> Tokenize(ExpressionSource source)
    {
        var text = source.Text;
        var tokens = new List<ExpressionToken>();
        var i = 0;
        while (i < text.Length)
        {
            var c = text[i];
            if (c is ' ' or '\t')
            {
                i++;
                continue;
            }
            if (c is '\r' or '\n')
            {
                // A block scalar leaves a trailing line break; anything after one would put carets on the wrong line.
                if (text.AsSpan(i).IsWhiteSpace()) break;
                throw source.Error(i, "an expression must be on one line");
            }
            if (IsDigit(c) || (c == '.' && i + 1 < text.Length && IsDigit(text[i + 1])))
            {
                i = ReadNumber(source, i, tokens);
                continue;
            }
            if (IsIdentifierStart(c))
            {
                var start = i;
                while (i < text.Length && IsIdentifierPart(text[i])) i++;
                var word = text[start..i];
                if (LogicWordOperator(word) is { } written)
                    throw source.Error(start,
                        $"'{word}' is not an operator; write '{written}' (a column named '{word}' is written {{{word}}})",
                        ErrorCodes.ExpressionLogicWord);
                tokens.Add(new ExpressionToken(ExpressionTokenKind.Identifier, start, word));
                continue;
            }
            if (c == '{')
            {
                i = ReadBracedName(source, i, tokens);
                continue;
            }
            if (c == '`') throw BackquotedName(source, i);
            var next = i + 1 < text.Length ? text[i + 1] : '\0';
            var (tokenKind, length) = c switch
            {
                '+' => (ExpressionTokenKind.Plus, 1),
                '-' => (ExpressionTokenKind.Minus, 1),
                '*' when next == '*' => throw source.Error(i, "'**' is not an operator; write powers with '^', like x^2"),
                '*' => (ExpressionTokenKind.Star, 1),
                '/' => (ExpressionTokenKind.Slash, 1),
                '%' => (ExpressionTokenKind.Percent, 1),
                '^' => (ExpressionTokenKind.Caret, 1),
                '(' => (ExpressionTokenKind.LeftParenthesis, 1),
                ')' => (ExpressionTokenKind.RightParenthesis, 1),
                ',' => (ExpressionTokenKind.Comma, 1),
                '<' when next == '=' => (ExpressionTokenKind.LessOrEqual, 2),
                '<' => (ExpressionTokenKind.Less, 1),
                '>' when next == '=' => (ExpressionTokenKind.GreaterOrEqual, 2),
                '>' => (ExpressionTokenKind.Greater, 1),
                '=' when next == '=' => (ExpressionTokenKind.Equal, 2),
                '=' => throw source.Error(i, "'=' would be an assignment, and expressions have none; compare with '=='"),
                '!' when next == '=' => (ExpressionTokenKind.NotEqual, 2),
                '!' => (ExpressionTokenKind.Not, 1),
                '&' when next == '&' => (ExpressionTokenKind.And, 2),
                '&' => throw source.Error(i, "unexpected character '&'; the logical and is '&&'"),
                '|' when next == '|' => (ExpressionTokenKind.Or, 2),
                '|' => throw source.Error(i, "unexpected character '|'; the logical or is '||'"),
                '}' => throw source.Error(i, "unexpected '}': no '{' opens it; a column name in braces is written {jet pt}"),
                '"' or '\'' => throw source.Error(i,
                    "strings are not allowed in expressions; a column name with unusual characters goes in braces, like {my column}"),
                '.' => throw source.Error(i,
                    "unexpected '.': expressions have no member access; a column name containing '.' goes in braces, like {jet.pt}"),
                _ => throw UnexpectedCharacter(source, i),
            };
            tokens.Add(new ExpressionToken(tokenKind, i, text.Substring(i, length)));
            i += length;
        }
        tokens.Add(new ExpressionToken(ExpressionTokenKind.End, text.Length, ""));
        return tokens;
    }

    private static int ReadNumber(ExpressionSource source, int start, List<ExpressionToken> tokens)
    {
        var text = source.Text;
        var i = start;
        while (i < text.Length && IsDigit(text[i])) i++;
        if (i < text.Length && text[i] == '.')
        {
            i++;
            while (i < text.Length && IsDigit(text[i])) i++;
        }
        if (i < text.Length && text[i] is 'e' or 'E')
        {
            var j = i + 1;
            if (j < text.Length && text[j] is '+' or '-') j++;
            if (j < text.Length && IsDigit(text[j]))
            {
                i = j;
                while (i < text.Length && IsDigit(text[i])) i++;
            }
        }
        if (i < text.Length && (IsIdentifierPart(text[i]) || text[i] == '.'))
        {
            // "2pi", "1e", "1.2.3": say which run of characters is not a number rather than guessing a product.
            var end = i;
            while (end < text.Length && (IsIdentifierPart(text[end]) || text[end] == '.')) end++;
            throw source.Error(start, $"malformed number '{text[start..end]}'");
        }
        var spelling = text[start..i];
        var value = double.Parse(spelling, NumberStyles.Float, CultureInfo.InvariantCulture);
        if (double.IsInfinity(value))
            throw source.Error(start, $"number '{spelling}' is too large for a double (the largest is about 1.8e308)");
        tokens.Add(new ExpressionToken(ExpressionTokenKind.Number, start, spelling, value));
        return i;
    }

    private static int ReadBracedName(ExpressionSource source, int start, List<ExpressionToken> tokens)
    {
        var text = source.Text;
        var close = text.IndexOf('}', start + 1);
        var lineBreak = text.IndexOfAny(['\r', '\n'], start + 1);
        if (close < 0 || (lineBreak >= 0 && lineBreak < close))
            throw source.Error(start, "this '{' is never closed; a column name in braces ends with '}', like {jet pt}");
        if (close == start + 1)
            throw source.Error(start, "empty column name {}");
        tokens.Add(new ExpressionToken(ExpressionTokenKind.QuotedIdentifier, start, text[(start + 1)..close]));
        return close + 1;
    }

    /// <summary>The operator a logic word stands for, or null for any other word.</summary>
    private static string? LogicWordOperator(string word) => word switch
    {
        "and" => "&&",
        "or" => "||",
        "not" => "!",
        _ => null,
    };

    /// <summary>A backquoted column name, refused with the braced spelling of the same name where it can be given.</summary>
    private static GateInputException BackquotedName(ExpressionSource source, int start)
    {
        var text = source.Text;
        var close = text.IndexOf('`', start + 1);
        var lineBreak = text.IndexOfAny(['\r', '\n'], start + 1);
        var name = close > start + 1 && (lineBreak < 0 || lineBreak > close) ? text[(start + 1)..close] : null;
        var instead = name is not null && !name.Contains('}') ? $"{{{name}}}" : "{jet pt}";
        return source.Error(start, $"backquotes do not quote column names; a column name that is not an identifier goes in braces: write {instead}",
            ErrorCodes.ExpressionBackquotedName);
    }

    private static Exception UnexpectedCharacter(ExpressionSource source, int i)
    {
        var text = source.Text;
        var codePoint = char.IsSurrogatePair(text, i) ? char.ConvertToUtf32(text[i], text[i + 1]) : text[i];
        var code = $"U+{codePoint.ToString("X4", CultureInfo.InvariantCulture)}";
        var category = CharUnicodeInfo.GetUnicodeCategory(codePoint);
        // Control, format (e.g. right-to-left overrides) and separator characters are named by code only,
        // so the message itself cannot be garbled by them.
        var visible = category is not (UnicodeCategory.Control or UnicodeCategory.Format or UnicodeCategory.Surrogate
            or UnicodeCategory.SpaceSeparator or UnicodeCategory.LineSeparator or UnicodeCategory.ParagraphSeparator
            or UnicodeCategory.OtherNotAssigned or UnicodeCategory.PrivateUse);
        var shown = visible ? $"'{char.ConvertFromUtf32(codePoint)}' ({code})" : code;
        if (codePoint < 128)
            return source.Error(i, $"unexpected character {shown}");
        var hint = Lookalikes.TryGetValue(codePoint, out var ascii) ? $"; did you mean {Quote(ascii)}?" : "";
        return source.Error(i,
            $"unexpected character {shown}: only ASCII letters, digits and operators are allowed outside braces{hint}");
    }

    private static string Quote(string ascii) => ascii.Contains(' ') ? ascii : $"'{ascii}'";

    private static bool IsDigit(char c) => c is >= '0' and <= '9';

    private static bool IsIdentifierStart(char c) => c is (>= 'A' and <= 'Z') or (>= 'a' and <= 'z') or '_';

    private static bool IsIdentifierPart(char c) => IsIdentifierStart(c) || IsDigit(c);
}
