using System.Text;
using System.Text.Encodings.Web;
using System.Text.Json;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// What every JSON result the commands write begins with (docs/result-json.md, docs/result.schema.json): the schema
/// version, the command that wrote it (the discriminator between the documents of the family), the tool's version and
/// whether the run finished. Also the document a run that did not finish leaves: the same head, the outcome
/// <c>did-not-finish</c> and the error, never an earlier run's result. Numbers that are not finite are written as
/// <c>null</c>; what a null means is documented per field.
/// </summary>
internal static class ResultJsonHead
{
    /// <summary>The version of the result documents' shape; raised whenever a field changes meaning or is removed.</summary>
    public const int SchemaVersion = 1;

    /// <summary>The writer's options: indented, non-ASCII written as is (names of features and files stay readable).</summary>
    public static JsonWriterOptions Options { get; } = new() { Indented = true, Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping };

    /// <summary>Writes the head's fields into the open object.</summary>
    public static void Write(Utf8JsonWriter w, string command, bool finished)
    {
        w.WriteNumber("schema_version", SchemaVersion);
        w.WriteString("command", command);
        w.WriteString("tool_version", ToolVersion.Current);
        w.WriteBoolean("finished", finished);
    }

    /// <summary>The contract's decision settings as the object <c>decision</c>, the same in every document.</summary>
    public static void WriteDecision(Utf8JsonWriter w, DecisionSettings d)
    {
        w.WriteStartObject("decision");
        w.WriteNumber("confidence", d.Confidence);
        w.WriteNumber("false_alarm", d.FalseAlarm);
        w.WriteString("correction", d.CorrectionName);
        w.WriteString("inconclusive", d.InconclusiveFails ? "fail" : "warn");
        w.WriteEndObject();
    }

    /// <summary>The contract as the object <c>contract</c> (path, title, SHA-256 of its file), the same in every document.</summary>
    public static void WriteContract(Utf8JsonWriter w, PrecisionContract contract)
    {
        w.WriteStartObject("contract");
        w.WriteString("path", Path.GetFullPath(contract.FilePath));
        w.WriteString("title", contract.DisplayName);
        w.WriteString("sha256", FileDigest.Sha256(contract.FilePath));
        w.WriteEndObject();
    }

    /// <summary>A finite number, or null.</summary>
    public static void NumberOrNull(Utf8JsonWriter w, string name, double value)
    {
        if (double.IsFinite(value)) w.WriteNumber(name, value);
        else w.WriteNull(name);
    }

    /// <summary>A place in a file as an object: file, line and column (0 when unknown).</summary>
    public static void Location(Utf8JsonWriter w, string name, SourceLocation? at)
    {
        if (at is null)
        {
            w.WriteNull(name);
            return;
        }
        w.WriteStartObject(name);
        w.WriteString("file", at.File);
        w.WriteNumber("line", at.Line);
        w.WriteNumber("column", at.Column);
        w.WriteEndObject();
    }

    /// <summary>
    /// The document of a run that did not reach a result: <paramref name="state"/> <c>running</c> while it runs (what a
    /// killed run leaves) or <c>stopped</c> with the error that stopped it.
    /// </summary>
    public static string Unfinished(string command, string contractPath, DateTimeOffset started, string state, string code, string message, SourceLocation? location)
    {
        using var buffer = new MemoryStream();
        using (var w = new Utf8JsonWriter(buffer, Options))
        {
            w.WriteStartObject();
            Write(w, command, finished: false);
            w.WriteString("outcome", RunOutcome.DidNotFinish.Token());
            w.WriteString("state", state);
            w.WriteString("started_utc", JUnitText.Timestamp(started));
            w.WriteStartObject("contract");
            w.WriteString("path", Path.GetFullPath(contractPath));
            w.WriteEndObject();
            w.WriteStartObject("error");
            w.WriteString("code", code);
            w.WriteString("message", message);
            Location(w, "location", location);
            w.WriteEndObject();
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(buffer.ToArray()) + "\n";
    }
}
