using System.Globalization;
using System.Net;
using System.Text;
using System.Xml;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// What a report path holds while a check runs, and after one that stopped: a report that says the check did not
/// finish (a JUnit <c>error</c>), or no file at all, never the previous run's verdict. Every requested report is
/// deleted first (deleting works on a full disk, where writing the marker may not), then the marker is written; a
/// killed or crashed run leaves the marker, a finished check replaces it with its own report.
/// </summary>
internal static class UnfinishedReport
{
    /// <summary>
    /// The report paths one run writes (any may be null: not requested); <paramref name="Command"/> names the command
    /// in the JSON result's head (<see cref="ResultJsonHead"/>).
    /// </summary>
    public sealed record Paths(string? JUnit, string? Text, string? Html, string? Markdown, string? Json = null, string Command = "check")
    {
        /// <summary>The requested paths.</summary>
        public IEnumerable<string> All => new[] { JUnit, Text, Html, Markdown, Json }.OfType<string>();
    }

    /// <summary>
    /// Deletes every requested report (the file a link points to, not the link), so that no earlier verdict survives
    /// whatever happens next. The paths must have passed <see cref="OutputPathGuard"/>: nothing else is deleted.
    /// </summary>
    public static void Clear(Paths paths)
    {
        foreach (var path in paths.All)
        {
            var target = LinkFreePath.Of(path);
            if (FileNode.Of(target).Kind != FileNodeKind.Regular) continue;
            try
            {
                File.Delete(target);
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                throw new GateInputException(ErrorCodes.OutputNotWritable,
                    $"Cannot remove the earlier report {target} before the check: {e.Message}", new SourceLocation(target));
            }
        }
    }

    /// <summary>Marks every requested report as under way (started at <paramref name="started"/>).</summary>
    public static void MarkRunning(Paths paths, string contractPath, DateTimeOffset started)
    {
        var message = "the check started at " + JUnitReport.Timestamp(started) +
                      " and has not finished; if this report stays, the check was stopped before it could write its result";
        foreach (var write in Writers(paths, contractPath, started, ErrorCodes.CheckUnfinished, message, null, "running")) write();
    }

    /// <summary>Replaces every requested report with one saying the check stopped on <paramref name="error"/>.</summary>
    public static void MarkFailed(Paths paths, string contractPath, DateTimeOffset started, GateInputException error) =>
        MarkStopped(paths, contractPath, started, error.Code, error.Message, error.Location);

    /// <summary>
    /// Replaces every requested report with one saying the check stopped (<paramref name="code"/>,
    /// <paramref name="message"/>); a report that cannot be written (a full disk) is deleted instead. Never throws for a
    /// report: the error that stopped the check is the one to show.
    /// </summary>
    public static void MarkStopped(Paths paths, string contractPath, DateTimeOffset started, string code, string message, SourceLocation? location)
    {
        var writers = Writers(paths, contractPath, started, code, message, location, "stopped");
        var requested = paths.All.ToList();
        for (var i = 0; i < writers.Count; i++)
        {
            try
            {
                writers[i]();
            }
            catch (Exception e) when (e is GateInputException or IOException or UnauthorizedAccessException)
            {
                try { File.Delete(LinkFreePath.Of(requested[i])); }
                catch (Exception d) when (d is IOException or UnauthorizedAccessException) { }
            }
        }
    }

    // One writer per requested report, in the order of Paths.All.
    private static List<Action> Writers(Paths paths, string contractPath, DateTimeOffset started, string code, string message, SourceLocation? location, string state)
    {
        var line = Diagnostic.Error(code, message, location).Line;
        var word = RunOutcome.DidNotFinish.Word();
        var writers = new List<Action>();
        if (paths.JUnit is { } junit) writers.Add(() => AtomicFile.WriteText(junit, UnfinishedJUnit.Render(contractPath, started, code, message, line)));
        if (paths.Text is { } text) writers.Add(() => AtomicFile.WriteText(text, word + ": " + line + Environment.NewLine));
        if (paths.Html is { } html)
            writers.Add(() => AtomicFile.WriteText(html, "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">" +
                $"<title>{word} · {WebUtility.HtmlEncode(Path.GetFileName(contractPath))} · GateTasks check</title></head>\n" +
                $"<body data-verdict=\"{RunOutcome.DidNotFinish.Token()}\"><h1>GateTasks check did not finish</h1><p><code>{WebUtility.HtmlEncode(contractPath)}</code></p><p>{WebUtility.HtmlEncode(line)}</p></body></html>\n"));
        if (paths.Markdown is { } markdown)
            // The message may quote a sample's cell: escaped, so a pull-request comment shows it as text.
            writers.Add(() => AtomicFile.WriteText(markdown, $"### GateTasks check {word}\n\n`{contractPath.Replace("`", "'")}`\n\n{MarkdownText.Escape(line)}\n"));
        if (paths.Json is { } json)
            writers.Add(() => AtomicFile.WriteText(json, ResultJsonHead.Unfinished(paths.Command, contractPath, started, state, code, message, location)));
        return writers;
    }
}
