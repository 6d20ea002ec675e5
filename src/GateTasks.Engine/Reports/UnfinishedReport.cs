using System.Globalization;
using System.Net;
using System.Text;
using System.Xml;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;

namespace GateTasks.Engine.Reports;

/// <summary>
/// What a report path holds while a check runs, and after one that stopped on bad input: a report that says the
/// check did not finish (a JUnit <c>error</c>), never the previous run's verdict. Written before the check starts,
/// it is what a killed or crashed run leaves behind; a finished check replaces it with its own report.
/// </summary>
internal static class UnfinishedReport
{
    /// <summary>The report paths one check writes (any may be null: not requested).</summary>
    public sealed record Paths(string? JUnit, string? Text, string? Html, string? Markdown);

    /// <summary>Marks every requested report as under way (started at <paramref name="started"/>).</summary>
    public static void MarkRunning(Paths paths, string contractPath, DateTimeOffset started) =>
        WriteAll(paths, contractPath, started, ErrorCodes.CheckUnfinished, "the check started at " + JUnitReport.Timestamp(started) +
            " and has not finished; if this report stays, the check was stopped before it could write its result", null);

    /// <summary>Replaces every requested report with one saying the check stopped on <paramref name="error"/>.</summary>
    public static void MarkFailed(Paths paths, string contractPath, DateTimeOffset started, GateInputException error) =>
        WriteAll(paths, contractPath, started, error.Code, error.Message, error.Location?.ToString());

    private static void WriteAll(Paths paths, string contractPath, DateTimeOffset started, string code, string message, string? location)
    {
        var where = location is null ? "" : location + ": ";
        var line = $"{where}error {code}: {message}";
        if (paths.JUnit is { } junit) AtomicFile.WriteText(junit, JUnit(contractPath, started, code, message, line));
        if (paths.Text is { } text) AtomicFile.WriteText(text, "NOT FINISHED: " + line + Environment.NewLine);
        if (paths.Markdown is { } markdown)
            AtomicFile.WriteText(markdown, $"### GateTasks check DID NOT FINISH\n\n`{contractPath}`\n\n{line}\n");
        if (paths.Html is { } html)
            AtomicFile.WriteText(html, "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>GateTasks check did not finish</title></head>\n" +
                $"<body><h1>GateTasks check did not finish</h1><p><code>{WebUtility.HtmlEncode(contractPath)}</code></p><p>{WebUtility.HtmlEncode(line)}</p></body></html>\n");
    }

    private static string JUnit(string contractPath, DateTimeOffset started, string code, string message, string line)
    {
        var settings = new XmlWriterSettings { Indent = true, Encoding = new UTF8Encoding(false), CheckCharacters = true };
        var sb = new StringBuilder();
        using (var w = XmlWriter.Create(new StringWriterUtf8(sb), settings))
        {
            // One test, in error, at both levels.
            (string, string)[] counts = [("tests", "1"), ("failures", "0"), ("errors", "1"), ("skipped", "0"), ("time", "0")];
            w.WriteStartElement("testsuites");
            w.WriteAttributeString("name", "gatetasks");
            foreach (var (name, value) in counts) w.WriteAttributeString(name, value);
            w.WriteAttributeString("timestamp", JUnitReport.Timestamp(started));
            w.WriteStartElement("testsuite");
            w.WriteAttributeString("name", JUnitReport.Clean(Path.GetFileName(contractPath)));
            foreach (var (name, value) in counts) w.WriteAttributeString(name, value);
            w.WriteAttributeString("timestamp", JUnitReport.Timestamp(started));
            w.WriteStartElement("testcase");
            w.WriteAttributeString("classname", "gatetasks");
            w.WriteAttributeString("name", "check");
            w.WriteAttributeString("time", "0");
            w.WriteStartElement("error");
            w.WriteAttributeString("type", code);
            w.WriteAttributeString("message", JUnitReport.Clean(message));
            w.WriteString(JUnitReport.Clean(line + "\ncontract: " + contractPath));
            w.WriteEndElement();
            w.WriteEndElement();
            w.WriteEndElement();
            w.WriteEndElement();
        }
        return sb.ToString();
    }
}
