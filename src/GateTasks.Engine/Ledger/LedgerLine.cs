using System.Globalization;
using System.Text;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ledger;

/// <summary>
/// One line of a ledger block: a keyword and its fields, separated by single spaces; a field with a space, a quote, a
/// backslash or nothing in it is written in double quotes with \" and \\ escapes. Numbers are written round-trip.
/// </summary>
internal sealed class LedgerLine
{
    private readonly List<string> _fields = [];

    public LedgerLine(string keyword) => _fields.Add(keyword);

    private LedgerLine(List<string> fields) => _fields = fields;

    public string Keyword => _fields[0];
    public IReadOnlyList<string> Fields => _fields;

    public LedgerLine Add(string field)
    {
        _fields.Add(field);
        return this;
    }

    public LedgerLine Add(double number) => Add(Number(number));

    public static string Number(double v) =>
        double.IsNaN(v) ? "none" : double.IsPositiveInfinity(v) ? "inf" : double.IsNegativeInfinity(v) ? "-inf" : v.ToString("R", CultureInfo.InvariantCulture);

    public static double ParseNumber(string text) => text switch
    {
        "none" => double.NaN,
        "inf" => double.PositiveInfinity,
        "-inf" => double.NegativeInfinity,
        _ => double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) ? v : throw new FormatException($"'{text}' is not a number"),
    };

    public override string ToString() => string.Join(' ', _fields.Select((f, i) => i == 0 ? f : Quote(f)));

    private static string Quote(string field)
    {
        if (field.Length > 0 && field.All(c => c > ' ' && c != '"' && c != '\\')) return field;
        var b = new StringBuilder("\"");
        foreach (var c in field)
        {
            if (c is '"' or '\\') b.Append('\\');
            b.Append(c);
        }
        return b.Append('"').ToString();
    }

    /// <summary>Splits a line into keyword and fields; a malformed quote is reported at its column.</summary>
    public static LedgerLine Parse(string text, string path, int line)
    {
        var fields = new List<string>();
        var i = 0;
        while (i < text.Length)
        {
            if (text[i] == ' ') { i++; continue; }
            if (text[i] == '"')
            {
                var start = i;
                var b = new StringBuilder();
                i++;
                while (true)
                {
                    if (i >= text.Length)
                        throw new GateInputException(ErrorCodes.LedgerSyntax, "A quoted field is not closed.", new SourceLocation(path, line, start + 1));
                    var c = text[i++];
                    if (c == '"') break;
                    if (c == '\\')
                    {
                        if (i >= text.Length)
                            throw new GateInputException(ErrorCodes.LedgerSyntax, "A quoted field ends in a lone backslash.", new SourceLocation(path, line, i));
                        c = text[i++];
                    }
                    b.Append(c);
                }
                fields.Add(b.ToString());
            }
            else
            {
                var start = i;
                while (i < text.Length && text[i] != ' ') i++;
                fields.Add(text[start..i]);
            }
        }
        if (fields.Count == 0) throw new GateInputException(ErrorCodes.LedgerSyntax, "An empty line inside an entry.", new SourceLocation(path, line, 1));
        return new LedgerLine(fields);
    }
}
