using System;
using System.Collections.Generic;
using System.Globalization;
using System.IO;
using System.Linq;
using System.Text;
using System.Text.RegularExpressions;
using System.Xml;
using Microsoft.Build.Framework;

namespace GateTasks.MSBuild;

/// <summary>
/// What the task leaves at a contract's report paths when the engine could not say anything itself (it is missing,
/// could not be started, was stopped, or died without a word): a JUnit report in the engine's "did not finish" form
/// (one test, <c>gatetasks</c>/<c>check</c>, in error with the code), and no other report, so none of an earlier
/// run can still say PASSED. The engine writes the same form itself when it stops on bad input.
/// </summary>
internal static class TaskUnfinishedReport
{
    // XML 1.0 forbids these even escaped.
    private static readonly Regex Forbidden = new(@"[\x00-\x08\x0B\x0C\x0E-\x1F]", RegexOptions.CultureInvariant);

    /// <summary>Writes the JUnit report and removes the others among <paramref name="reports"/>.</summary>
    public static void Write(IEnumerable<ITaskItem> reports, string contract, string code, string message)
    {
        foreach (var report in reports)
        {
            var path = report.ItemSpec;
            // Never over an input: a report path that is the contract is the engine's to refuse.
            if (string.Equals(Path.GetFullPath(path), contract, StringComparison.Ordinal)) continue;
            try
            {
                if (report.GetMetadata("Kind") == "junit")
                {
                    Directory.CreateDirectory(Path.GetDirectoryName(path)!);
                    var temporary = path + "." + Guid.NewGuid().ToString("N") + ".tmp";
                    File.WriteAllText(temporary, JUnit(contract, code, message), new UTF8Encoding(false));
                    if (File.Exists(path)) File.Replace(temporary, path, null);
                    else File.Move(temporary, path);
                }
                else if (File.Exists(path)) File.Delete(path);
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                // The report folder itself is unusable: the build's error already says the check did not run.
            }
        }
    }

    private static string JUnit(string contract, string code, string message)
    {
        var timestamp = DateTimeOffset.UtcNow.ToString("yyyy-MM-dd'T'HH:mm:ss'Z'", CultureInfo.InvariantCulture);
        var line = $"error {code}: {message}";
        var sb = new StringBuilder();
        var settings = new XmlWriterSettings { Indent = true, OmitXmlDeclaration = false };
        using (var w = XmlWriter.Create(new StringWriter(sb, CultureInfo.InvariantCulture), settings))
        {
            (string, string)[] counts = [("tests", "1"), ("failures", "0"), ("errors", "1"), ("skipped", "0"), ("time", "0")];
            w.WriteStartElement("testsuites");
            w.WriteAttributeString("name", "gatetasks");
            foreach (var (name, value) in counts) w.WriteAttributeString(name, value);
            w.WriteAttributeString("timestamp", timestamp);
            w.WriteStartElement("testsuite");
            w.WriteAttributeString("name", Clean(Path.GetFileName(contract)));
            foreach (var (name, value) in counts) w.WriteAttributeString(name, value);
            w.WriteAttributeString("timestamp", timestamp);
            w.WriteStartElement("testcase");
            w.WriteAttributeString("classname", "gatetasks");
            w.WriteAttributeString("name", "check");
            w.WriteAttributeString("time", "0");
            w.WriteStartElement("error");
            w.WriteAttributeString("type", code);
            w.WriteAttributeString("message", Clean(message));
            w.WriteString(Clean(line + "\ncontract: " + contract));
            w.WriteEndElement();
            w.WriteEndElement();
            w.WriteEndElement();
            w.WriteEndElement();
        }
        // StringWriter reports UTF-16; the file is UTF-8.
        return sb.ToString().Replace("encoding=\"utf-16\"", "encoding=\"utf-8\"");
    }

    private static string Clean(string text) => Forbidden.Replace(text, "");
}
