using System;
using System.Globalization;
using System.Text;
using System.Xml;

namespace GateTasks.Engine.Reports;

/// <summary>
/// Text as JUnit XML may carry it, and its timestamps. Depends on nothing but the base library: the build step's task
/// compiles this file too, so that the report it writes when the engine cannot run reads exactly as the engine's.
/// </summary>
internal static class JUnitText
{
    /// <summary>
    /// Drops characters XML 1.0 cannot carry (NUL and C0 controls other than tab, LF, CR, even escaped) and ANSI
    /// escape sequences, which would make the whole file unreadable to consumers.
    /// </summary>
    public static string Clean(string text)
    {
        var sb = new StringBuilder(text.Length);
        for (var i = 0; i < text.Length; i++)
        {
            var ch = text[i];
            if (ch == '\u001b' && i + 1 < text.Length && text[i + 1] == '[')
            {
                i += 2;
                while (i < text.Length && !(text[i] >= '@' && text[i] <= '~')) i++;
                continue;
            }
            if (char.IsHighSurrogate(ch) && i + 1 < text.Length && char.IsLowSurrogate(text[i + 1]))
            {
                sb.Append(ch).Append(text[++i]);
                continue;
            }
            if (XmlConvert.IsXmlChar(ch)) sb.Append(ch);
        }
        return sb.ToString();
    }

    /// <summary>ISO 8601, UTC, to the second.</summary>
    public static string Timestamp(DateTimeOffset t) => t.UtcDateTime.ToString("yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture);
}
