using System;
using System.IO;
using System.Text;
using System.Xml;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The JUnit form of a check that did not finish: one test, <c>gatetasks</c>/<c>check</c>, in error with the code, at
/// both levels. Written by the engine when a check stops, and by the build step's task (which compiles this file too)
/// when the engine is missing, cannot start or dies without a word.
/// </summary>
internal static class UnfinishedJUnit
{
    /// <summary>The report for <paramref name="contractPath"/>; <paramref name="line"/> is the coded diagnostic line.</summary>
    public static string Render(string contractPath, DateTimeOffset started, string code, string message, string line)
    {
        var settings = new XmlWriterSettings { Indent = true, Encoding = new UTF8Encoding(false), CheckCharacters = true };
        var sb = new StringBuilder();
        using (var w = XmlWriter.Create(new StringWriterUtf8(sb), settings))
        {
            (string, string)[] counts = [("tests", "1"), ("failures", "0"), ("errors", "1"), ("skipped", "0"), ("time", "0")];
            w.WriteStartElement("testsuites");
            w.WriteAttributeString("name", "gatetasks");
            foreach (var (name, value) in counts) w.WriteAttributeString(name, value);
            w.WriteAttributeString("timestamp", JUnitText.Timestamp(started));
            w.WriteStartElement("testsuite");
            w.WriteAttributeString("name", JUnitText.Clean(Path.GetFileName(contractPath)));
            foreach (var (name, value) in counts) w.WriteAttributeString(name, value);
            w.WriteAttributeString("timestamp", JUnitText.Timestamp(started));
            // The run's outcome, as a finished report states it too (gatetasks.outcome).
            w.WriteStartElement("properties");
            w.WriteStartElement("property");
            w.WriteAttributeString("name", "gatetasks.outcome");
            w.WriteAttributeString("value", RunOutcome.DidNotFinish.Token());
            w.WriteEndElement();
            w.WriteEndElement();
            w.WriteStartElement("testcase");
            w.WriteAttributeString("classname", "gatetasks");
            w.WriteAttributeString("name", "check");
            w.WriteAttributeString("time", "0");
            w.WriteStartElement("error");
            w.WriteAttributeString("type", code);
            w.WriteAttributeString("message", JUnitText.Clean(message));
            w.WriteString(JUnitText.Clean(line + "\ncontract: " + contractPath));
            w.WriteEndElement();
            w.WriteEndElement();
            w.WriteEndElement();
            w.WriteEndElement();
        }
        return sb.ToString();
    }
}
