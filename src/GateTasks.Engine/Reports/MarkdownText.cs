using System.Text;

namespace GateTasks.Engine.Reports;

/// <summary>
/// Free text (a message that may quote a sample's cell or a file name) made safe for a Markdown report: a pull-request
/// comment or a CI job summary must show it as text, never render it as HTML or as Markdown markup.
/// </summary>
internal static class MarkdownText
{
    /// <summary>
    /// <paramref name="text"/> on one line with <c>&amp;</c>, <c>&lt;</c> and <c>&gt;</c> as character references (so no
    /// renderer sees a tag, whatever its rules for backslashes) and the Markdown punctuation backslash-escaped
    /// (CommonMark 0.31 §2.4: any ASCII punctuation may be escaped).
    /// </summary>
    public static string Escape(string text)
    {
        var sb = new StringBuilder(text.Length);
        foreach (var ch in text)
        {
            switch (ch)
            {
                case '&': sb.Append("&amp;"); continue;
                case '<': sb.Append("&lt;"); continue;
                case '>': sb.Append("&gt;"); continue;
                case '\r' or '\n': sb.Append(' '); continue;
            }
            if (ch is '\\' or '`' or '*' or '_' or '[' or ']' or '#' or '|' or '!') sb.Append('\\');
            sb.Append(ch);
        }
        return sb.ToString();
    }
}
