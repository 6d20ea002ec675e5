using System;
using System.Collections.Generic;
using System.Globalization;
using System.Text;

namespace GateTasks.Engine.Diagnostics;

/// <summary>
/// One record of the machine-readable stream the command line writes for the build step when
/// <see cref="EnvironmentVariable"/> names a file: JSON lines, one flat object per line, each with the stream's
/// version <c>v</c> and a <c>type</c>: a <c>diagnostic</c> (code, severity, kind, file, line, column, text), the run's
/// <c>outcome</c>, a <c>report</c> written (kind, path), a <c>text</c> line of the console (level, text), an
/// <c>input</c> or a <c>dependency</c> (path) of the inputs command. An internal interface between the two halves of
/// the package (docs/msbuild.md); it never changes without a new version.
/// </summary>
/// <remarks>
/// Dependency-free, and with its own small JSON reader, because the build step's task compiles this file too: the task
/// must load in every MSBuild, so it ships no JSON library (System.Text.Json is not part of netstandard2.0). The reader
/// takes only what <see cref="ToJson"/> writes — a flat object of strings, integers and nulls — and refuses the rest.
/// </remarks>
internal sealed class RunRecord
{
    /// <summary>The stream's version; a reader refuses records of another.</summary>
    public const int Version = 1;

    /// <summary>The environment variable naming the file the command line writes the stream to.</summary>
    public const string EnvironmentVariable = "GATETASKS_RECORDS";

    /// <summary>A coded message (<c>Diagnostic</c>).</summary>
    public const string DiagnosticType = "diagnostic";
    /// <summary>How the run ended (<see cref="Outcome"/> holds the outcome's token: passed, failed, undecided, not-accepted, did-not-finish).</summary>
    public const string OutcomeType = "outcome";
    /// <summary>A report the run wrote (<see cref="Kind"/>: junit, text, html, markdown; <see cref="Path"/>).</summary>
    public const string ReportType = "report";
    /// <summary>A line of the console's text (<see cref="Level"/>, <see cref="Text"/>).</summary>
    public const string TextType = "text";
    /// <summary>A file a check reads (the inputs command).</summary>
    public const string InputType = "input";
    /// <summary>A file or folder whose state decides the list of inputs (the inputs command).</summary>
    public const string DependencyType = "dependency";

    /// <summary>Text level: the one-line verdict, shown at every verbosity.</summary>
    public const string SummaryLevel = "summary";
    /// <summary>Text level: progress of a long read and the ledger history note, shown at normal verbosity.</summary>
    public const string NoteLevel = "note";
    /// <summary>Text level: the table and the rest, shown at detailed verbosity.</summary>
    public const string DetailLevel = "detail";

    /// <summary>Creates a record of <paramref name="type"/>.</summary>
    public RunRecord(string type, int version = Version)
    {
        Type = type;
        V = version;
    }

    /// <summary>The stream version the record was written with.</summary>
    public int V { get; }
    /// <summary>What the record is (the <c>*Type</c> constants).</summary>
    public string Type { get; }
    /// <summary>Diagnostic: the code.</summary>
    public string? Code { get; set; }
    /// <summary>Diagnostic: <c>error</c> or <c>warning</c>.</summary>
    public string? Severity { get; set; }
    /// <summary>Diagnostic: its kind's token (setup, contract, sample, drift, inconclusive, ratchet, acceptance); report: junit, text, html, markdown.</summary>
    public string? Kind { get; set; }
    /// <summary>Diagnostic: the file it is about, if any.</summary>
    public string? File { get; set; }
    /// <summary>Diagnostic: the line (1-based; 0 not known).</summary>
    public int Line { get; set; }
    /// <summary>Diagnostic: the column (1-based; 0 not known).</summary>
    public int Column { get; set; }
    /// <summary>Diagnostic or text: what it says.</summary>
    public string? Text { get; set; }
    /// <summary>Text: <see cref="SummaryLevel"/>, <see cref="NoteLevel"/> or <see cref="DetailLevel"/>.</summary>
    public string? Level { get; set; }
    /// <summary>Outcome: passed, failed, undecided, not-accepted or did-not-finish.</summary>
    public string? Outcome { get; set; }
    /// <summary>Report, input or dependency: the absolute path.</summary>
    public string? Path { get; set; }

    /// <summary>The record as one line of JSON (RFC 8259), without the line break.</summary>
    public string ToJson()
    {
        var sb = new StringBuilder("{\"v\":").Append(V.ToString(CultureInfo.InvariantCulture));
        Field(sb, "type", Type);
        Field(sb, "code", Code);
        Field(sb, "severity", Severity);
        Field(sb, "kind", Kind);
        Field(sb, "file", File);
        if (Type == DiagnosticType)
        {
            sb.Append(",\"line\":").Append(Line.ToString(CultureInfo.InvariantCulture));
            sb.Append(",\"column\":").Append(Column.ToString(CultureInfo.InvariantCulture));
        }
        Field(sb, "text", Text);
        Field(sb, "level", Level);
        Field(sb, "outcome", Outcome);
        Field(sb, "path", Path);
        return sb.Append('}').ToString();
    }

    private static void Field(StringBuilder sb, string name, string? value)
    {
        if (value is null) return;
        sb.Append(",\"").Append(name).Append("\":");
        Quote(sb, value);
    }

    private static void Quote(StringBuilder sb, string value)
    {
        sb.Append('"');
        foreach (var c in value)
        {
            switch (c)
            {
                case '"': sb.Append("\\\""); break;
                case '\\': sb.Append("\\\\"); break;
                case '\n': sb.Append("\\n"); break;
                case '\r': sb.Append("\\r"); break;
                case '\t': sb.Append("\\t"); break;
                default:
                    // Other control characters, and the line and paragraph separators some readers split lines on.
                    if (c < 0x20 || c == '\u2028' || c == '\u2029') sb.Append("\\u").Append(((int)c).ToString("x4", CultureInfo.InvariantCulture));
                    else sb.Append(c);
                    break;
            }
        }
        sb.Append('"');
    }

    /// <summary>
    /// The record on one line of the stream; null when the line is not a flat JSON object of strings, integers and
    /// nulls with a version and a type (a torn last line of a stopped run, or anything else).
    /// </summary>
    public static RunRecord? Parse(string line)
    {
        var fields = new Dictionary<string, object?>(StringComparer.Ordinal);
        var i = 0;
        Space(line, ref i);
        if (!Take(line, ref i, '{')) return null;
        Space(line, ref i);
        if (!Take(line, ref i, '}'))
        {
            while (true)
            {
                Space(line, ref i);
                if (ReadString(line, ref i) is not { } name) return null;
                Space(line, ref i);
                if (!Take(line, ref i, ':')) return null;
                Space(line, ref i);
                if (!ReadValue(line, ref i, out var value) || fields.ContainsKey(name)) return null;
                fields[name] = value;
                Space(line, ref i);
                if (Take(line, ref i, ',')) continue;
                if (Take(line, ref i, '}')) break;
                return null;
            }
        }
        Space(line, ref i);
        if (i != line.Length) return null;
        if (!(Get(fields, "v") is long v && v is > 0 and <= int.MaxValue) || Get(fields, "type") is not string type) return null;
        var record = new RunRecord(type, (int)v)
        {
            Code = Get(fields, "code") as string,
            Severity = Get(fields, "severity") as string,
            Kind = Get(fields, "kind") as string,
            File = Get(fields, "file") as string,
            Text = Get(fields, "text") as string,
            Level = Get(fields, "level") as string,
            Outcome = Get(fields, "outcome") as string,
            Path = Get(fields, "path") as string,
        };
        if (Get(fields, "line") is long l && l is >= 0 and <= int.MaxValue) record.Line = (int)l;
        if (Get(fields, "column") is long c && c is >= 0 and <= int.MaxValue) record.Column = (int)c;
        return record;
    }

    private static object? Get(Dictionary<string, object?> fields, string name) => fields.TryGetValue(name, out var value) ? value : null;

    private static void Space(string s, ref int i)
    {
        while (i < s.Length && s[i] is ' ' or '\t' or '\r' or '\n') i++;
    }

    private static bool Take(string s, ref int i, char c)
    {
        if (i >= s.Length || s[i] != c) return false;
        i++;
        return true;
    }

    private static bool ReadValue(string s, ref int i, out object? value)
    {
        value = null;
        if (i >= s.Length) return false;
        if (s[i] == '"') return (value = ReadString(s, ref i)) is not null;
        if (string.CompareOrdinal(s, i, "null", 0, 4) == 0)
        {
            i += 4;
            return true;
        }
        // Integers only (line, column, version): no fraction, no exponent.
        var start = i;
        if (i < s.Length && s[i] == '-') i++;
        while (i < s.Length && s[i] >= '0' && s[i] <= '9') i++;
        if (i == start || (i == start + 1 && s[start] == '-')) return false;
        if (!long.TryParse(s.Substring(start, i - start), NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out var n)) return false;
        value = n;
        return true;
    }

    private static string? ReadString(string s, ref int i)
    {
        if (!Take(s, ref i, '"')) return null;
        var sb = new StringBuilder();
        while (i < s.Length)
        {
            var c = s[i++];
            if (c == '"') return sb.ToString();
            if (c < 0x20) return null;
            if (c != '\\') { sb.Append(c); continue; }
            if (i >= s.Length) return null;
            switch (s[i++])
            {
                case '"': sb.Append('"'); break;
                case '\\': sb.Append('\\'); break;
                case '/': sb.Append('/'); break;
                case 'b': sb.Append('\b'); break;
                case 'f': sb.Append('\f'); break;
                case 'n': sb.Append('\n'); break;
                case 'r': sb.Append('\r'); break;
                case 't': sb.Append('\t'); break;
                case 'u':
                    if (i + 4 > s.Length || !int.TryParse(s.Substring(i, 4), NumberStyles.AllowHexSpecifier, CultureInfo.InvariantCulture, out var code)) return null;
                    sb.Append((char)code);
                    i += 4;
                    break;
                default: return null;
            }
        }
        return null;
    }
}
