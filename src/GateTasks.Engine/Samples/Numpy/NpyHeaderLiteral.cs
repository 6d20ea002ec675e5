using System.Globalization;
using System.Text;

namespace GateTasks.Engine.Samples.Numpy;

/// <summary>
/// Parses the one value a .npy header holds: a Python literal made of dictionaries, lists, tuples, quoted strings,
/// integers, <c>True</c>, <c>False</c> and <c>None</c> (the NumPy format description, version 1.0 to 3.0). Nothing
/// is evaluated. A dictionary becomes <see cref="Dictionary{TKey,TValue}"/> of string keys, a list or tuple a
/// <see cref="List{T}"/>, an integer a <see cref="long"/>. Throws <see cref="FormatException"/> on anything else.
/// </summary>
internal sealed class NpyHeaderLiteral
{
    private readonly string _text;
    private int _at;

    private NpyHeaderLiteral(string text) => _text = text;

    /// <summary>The value <paramref name="text"/> spells, which must be all of it (whitespace aside).</summary>
    public static object? Parse(string text)
    {
        var parser = new NpyHeaderLiteral(text);
        var value = parser.Value(depth: 0);
        parser.SkipSpace();
        if (parser._at != text.Length) throw parser.Error("text after the value");
        return value;
    }

    private object? Value(int depth)
    {
        if (depth > 32) throw Error("nesting deeper than 32 levels");
        SkipSpace();
        if (_at >= _text.Length) throw Error("the header ends early");
        var c = _text[_at];
        switch (c)
        {
            case '{': return Dictionary(depth);
            case '[': return Sequence(']', depth);
            case '(': return Sequence(')', depth);
            case '\'' or '"': return QuotedString();
        }
        if (c == '-' || c == '+' || char.IsAsciiDigit(c)) return Integer();
        foreach (var (word, value) in new (string, object?)[] { ("True", true), ("False", false), ("None", null) })
            if (string.CompareOrdinal(_text, _at, word, 0, word.Length) == 0)
            {
                _at += word.Length;
                return value;
            }
        throw Error($"unexpected '{c}'");
    }

    private Dictionary<string, object?> Dictionary(int depth)
    {
        _at++; // '{'
        var result = new Dictionary<string, object?>(StringComparer.Ordinal);
        while (true)
        {
            SkipSpace();
            if (Take('}')) return result;
            if (Value(depth + 1) is not string key) throw Error("a dictionary key that is not a string");
            SkipSpace();
            if (!Take(':')) throw Error("':' expected after a key");
            if (!result.TryAdd(key, Value(depth + 1))) throw Error($"the key '{key}' twice");
            SkipSpace();
            if (Take('}')) return result;
            if (!Take(',')) throw Error("',' or '}' expected");
        }
    }

    private List<object?> Sequence(char close, int depth)
    {
        _at++; // '[' or '('
        var items = new List<object?>();
        while (true)
        {
            SkipSpace();
            if (Take(close)) return items;
            items.Add(Value(depth + 1));
            SkipSpace();
            if (Take(close)) return items;
            if (!Take(',')) throw Error($"',' or '{close}' expected");
        }
    }

    private string QuotedString()
    {
        var quote = _text[_at++];
        var sb = new StringBuilder();
        while (_at < _text.Length && _text[_at] != quote)
        {
            var c = _text[_at++];
            if (c != '\\') { sb.Append(c); continue; }
            if (_at >= _text.Length) break;
            var e = _text[_at++];
            switch (e)
            {
                case 'n': sb.Append('\n'); break;
                case 't': sb.Append('\t'); break;
                case 'r': sb.Append('\r'); break;
                case '0': sb.Append('\0'); break;
                case 'x' when _at + 2 <= _text.Length: sb.Append((char)Hex(2)); break;
                case 'u' when _at + 4 <= _text.Length: sb.Append((char)Hex(4)); break;
                case 'U' when _at + 8 <= _text.Length: sb.Append(char.ConvertFromUtf32(Hex(8))); break;
                default: sb.Append(e); break; // \\, \', \"
            }
        }
        if (!Take(quote)) throw Error("a string that is not closed");
        return sb.ToString();
    }

    private int Hex(int digits)
    {
        if (!int.TryParse(_text.AsSpan(_at, digits), NumberStyles.AllowHexSpecifier, CultureInfo.InvariantCulture, out var code)
            || code is < 0 or > 0x10FFFF)
            throw Error("a bad escape in a string");
        _at += digits;
        return code;
    }

    private long Integer()
    {
        var start = _at;
        if (_text[_at] is '-' or '+') _at++;
        while (_at < _text.Length && char.IsAsciiDigit(_text[_at])) _at++;
        if (_at < _text.Length && _text[_at] == 'L') _at++; // Python 2 long integers, in files of old NumPy versions
        var digits = _text.AsSpan(start, _at - start).TrimEnd('L');
        if (!long.TryParse(digits, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out var value))
            throw Error($"'{digits}' is not an integer that fits in 64 bits");
        return value;
    }

    private bool Take(char c)
    {
        if (_at >= _text.Length || _text[_at] != c) return false;
        _at++;
        return true;
    }

    private void SkipSpace()
    {
        while (_at < _text.Length && char.IsWhiteSpace(_text[_at])) _at++;
    }

    private FormatException Error(string what) => new($"{what} at character {_at + 1} of the header");
}
