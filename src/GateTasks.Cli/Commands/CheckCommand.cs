using System.CommandLine;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Reports;

namespace GateTasks.Cli.Commands;

/// <summary><c>gatetasks check</c>: judges a surrogate sample against the contract's reference.</summary>
internal static class CheckCommand
{
    public static Command Create(TextWriter stdout, TextWriter stderr)
    {
        var contract = SharedOptions.Contract();
        var sample = SharedOptions.Sample();
        var junit = new Option<string?>("--junit")
        {
            Description = "Also write a JUnit XML report to this path.",
        };
        var text = new Option<string?>("--text")
        {
            Description = "Also write the result table and summary as plain text to this path.",
        };
        var html = new Option<string?>("--html")
        {
            Description = "Also write a self-contained HTML report with a plot per feature to this path.",
        };
        var markdown = new Option<string?>("--markdown")
        {
            Description = "Also write a Markdown summary (for a pull-request comment or CI job summary) to this path.",
        };
        var partials = new Option<string[]>("--partials")
        {
            Description = "Decide from partial files (from 'gatetasks fill' on shards of the sample, or 'gatetasks merge') instead of reading a sample.",
            AllowMultipleArgumentsPerToken = true,
        };
        var baseRevision = SharedOptions.BaseRevision();
        var command = new Command("check", "Check a surrogate sample against the reference under the contract's tolerances. Exit 0: all pass; 1: a check failed (or was inconclusive, if the contract says so); 2: input error; 4: the checks pass but the contract or reference in use is not the accepted one (see the ledger errors).")
        {
            contract, sample, junit, text, html, markdown, partials, baseRevision,
        };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
        {
            var contractPath = parse.GetValue(contract)!;
            var reports = new UnfinishedReport.Paths(parse.GetValue(junit), parse.GetValue(text), parse.GetValue(html), parse.GetValue(markdown));
            var started = DateTimeOffset.UtcNow;
            // No report path keeps an earlier verdict while this check runs, or after it stops on bad input: what a
            // killed run leaves says it did not finish.
            UnfinishedReport.MarkRunning(reports, contractPath, started);
            try
            {
                return Check(contractPath, parse.GetValue(sample), parse.GetValue(partials), parse.GetValue(baseRevision), reports, stdout, stderr);
            }
            catch (GateInputException e)
            {
                try { UnfinishedReport.MarkFailed(reports, contractPath, started, e); }
                catch (GateInputException) { } // the report path itself is the problem: the original error says more
                throw;
            }
        }));
        return command;
    }

    private static int Check(string contractPath, string? samplePath, string[]? partials, string? baseRevision, UnfinishedReport.Paths reports,
        TextWriter stdout, TextWriter stderr)
    {
        var loaded = ContractLoader.Load(contractPath);
        // Before the sample is read: an unknown base revision stops the run at once.
        var history = SharedOptions.CheckHistory(loaded, baseRevision);
        stdout.WriteLine(history.Note);
        var report = partials is { Length: > 0 }
            ? ContractCheck.RunFromPartials(loaded, ShardCommands.Expand(partials))
            : ContractCheck.Run(loaded, samplePath, ProgressDisplay.For(stdout, stderr));
        if (history.Finding is { } finding) report = report with { Acceptance = [finding, .. report.Acceptance] };
        if (reports.Text is { } textPath)
            AtomicFile.WriteText(textPath, ResultTable.Format(report) + Environment.NewLine + ResultTable.Summary(report) + Environment.NewLine);
        var written = new List<string>();
        if (reports.Html is { } htmlPath)
        {
            HtmlReport.Write(htmlPath, report);
            written.Add($"HTML report: {Path.GetFullPath(htmlPath)}");
        }
        if (reports.Markdown is { } markdownPath)
        {
            MarkdownSummary.Write(markdownPath, report);
            written.Add($"Markdown summary: {Path.GetFullPath(markdownPath)}");
        }
        var exit = Print(report, reports.JUnit, stdout, stderr);
        foreach (var line in written) stdout.WriteLine(line);
        return exit;
    }

    /// <summary>Prints the table, one diagnostic line per failed check, the summary; writes the JUnit report.</summary>
    public static int Print(CheckReport report, string? junitPath, TextWriter stdout, TextWriter stderr)
    {
        stdout.WriteLine($"contract  {report.Contract.FilePath}");
        stdout.WriteLine($"reference {report.ReferencePath} (sha256 {report.ReferenceSha256[..12]}…)");
        stdout.WriteLine($"sample    {string.Join(", ", report.SampleFiles)}");
        stdout.WriteLine();
        stdout.Write(ResultTable.Format(report));
        stdout.WriteLine();
        foreach (var o in report.Outcomes.Where(o => o.Verdict == Verdict.Fail))
            stderr.WriteLine($"{o.Check.Location}: error {CheckEvaluator.DriftCode(o.Check)}: feature '{o.Feature.Name}' {o.Check.Label}: {o.Summary}");
        var severity = report.Contract.Decision.InconclusiveFails ? "error" : "warning";
        foreach (var o in report.Outcomes.Where(o => o.Verdict == Verdict.Inconclusive))
            stderr.WriteLine($"{o.Check.Location}: {severity} {CheckEvaluator.InconclusiveCode}: feature '{o.Feature.Name}' {o.Check.Label} is inconclusive: {o.Summary}; " +
                             ResultTable.NeededText(o.Measured.EventsNeeded));
        foreach (var f in report.Acceptance)
            stderr.WriteLine($"{f.Location}: {(f.IsError ? "error" : "warning")} {f.Code}: {f.Message}");
        // NaN and ±∞ the contract allows are still counted, and said.
        foreach (var c in report.Comparisons.Where(c => c.SurrogateSummary.NonFiniteCount > 0))
            stdout.WriteLine($"note: feature '{c.Spec.Name}' has {c.SurrogateSummary.NanCount} NaN, {c.SurrogateSummary.PositiveInfinityCount} +∞ and " +
                             $"{c.SurrogateSummary.NegativeInfinityCount} −∞ in the surrogate sample, counted apart (non-finite: allow).");
        if (junitPath is not null)
        {
            JUnitReport.Write(junitPath, [report]);
            stdout.WriteLine($"JUnit report: {Path.GetFullPath(junitPath)}");
        }
        stdout.WriteLine(ResultTable.Summary(report));
        if (!report.AcceptanceHolds)
            stdout.WriteLine($"NOT ACCEPTED: {report.Acceptance.Count(f => f.IsError)} ledger error(s) above; the contract or reference in use is not the accepted one.");
        return !report.Passed ? ExitCodes.ChecksFailed : report.AcceptanceHolds ? ExitCodes.Success : ExitCodes.Unaccepted;
    }
}
