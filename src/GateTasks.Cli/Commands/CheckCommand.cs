using System.CommandLine;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Reports;
using GateTasks.Engine.Runs;

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
        }.NotEmpty();
        var text = new Option<string?>("--text")
        {
            Description = "Also write the result table and summary as plain text to this path.",
        }.NotEmpty();
        var html = new Option<string?>("--html")
        {
            Description = "Also write a self-contained HTML report with a plot per feature to this path.",
        }.NotEmpty();
        var markdown = new Option<string?>("--markdown")
        {
            Description = "Also write a Markdown summary (for a pull-request comment or CI job summary) to this path.",
        }.NotEmpty();
        var partials = new Option<string[]>("--partials")
        {
            Description = "Decide from partial files (from 'gatetasks fill' on shards of the sample, or 'gatetasks merge') instead of reading a sample.",
            AllowMultipleArgumentsPerToken = true,
        }.NotEmpty();
        var baseRevision = SharedOptions.BaseRevision();
        var command = new Command("check", "Check a surrogate sample against the reference under the contract's tolerances. Exit 0: all pass; 1: a check failed (or was inconclusive, if the contract says so); 2: input error; 4: the checks pass but the contract or reference in use is not the accepted one (see the ledger errors).")
        {
            contract, sample, junit, text, html, markdown, partials, baseRevision,
        };
        command.SetAction(parse => CliApp.Guard(stderr, () =>
            Run(parse.GetValue(contract)!, parse.GetValue(sample), parse.GetValue(partials), parse.GetValue(baseRevision),
                new UnfinishedReport.Paths(parse.GetValue(junit), parse.GetValue(text), parse.GetValue(html), parse.GetValue(markdown)),
                stdout, stderr)));
        return command;
    }

    private static int Run(string contractPath, string? samplePath, string[]? partials, string? baseRevision, UnfinishedReport.Paths reports,
        TextWriter stdout, TextWriter stderr)
    {
        var started = DateTimeOffset.UtcNow;
        // Every file the check reads, found without reading any at length; an input error here is held until the
        // reports are cleared, so that it is what they say.
        var paths = new RunPaths().Write(reports.JUnit, "--junit").Write(reports.Text, "--text").Write(reports.Html, "--html")
            .Write(reports.Markdown, "--markdown").Read(contractPath, "the contract");
        PrecisionContract? loaded = null;
        GateInputException? pending = null;
        try
        {
            loaded = ContractLoader.Load(contractPath);
            paths.Contract(loaded, readsLedger: true);
        }
        catch (GateInputException e)
        {
            pending = e;
            // The contract's own ledger is unknown; at least the default one is never overwritten.
            paths.Keep(Path.Combine(Path.GetDirectoryName(Path.GetFullPath(contractPath))!, AcceptanceSettings.DefaultLedgerName(contractPath)),
                "the contract's acceptance ledger");
        }
        try
        {
            if (partials is { Length: > 0 }) paths.Read(ShardCommands.Expand(partials), "a partial file");
            else if (samplePath is not null) paths.Read(Engine.Samples.SampleFiles.Resolve(samplePath, Directory.GetCurrentDirectory()), "a sample file");
            else if (loaded is not null) paths.Read(ContractInputs.SampleFiles(loaded, null), "a sample file");
        }
        catch (GateInputException e)
        {
            pending ??= e;
        }
        // A report path that would destroy an input, or is no regular file, is refused and left untouched; every other
        // requested report still loses its earlier verdict and says why the run stopped.
        try
        {
            paths.VerifyOutputs();
        }
        catch (GateInputException e)
        {
            string? Safe(string? path) => paths.CanWriteAlone(path) ? path : null;
            var others = new UnfinishedReport.Paths(Safe(reports.JUnit), Safe(reports.Text), Safe(reports.Html), Safe(reports.Markdown));
            UnfinishedReport.Clear(others);
            UnfinishedReport.MarkFailed(others, contractPath, started, e);
            throw;
        }

        try
        {
            // No report keeps an earlier verdict, whatever happens next: removed first (which works on a full disk),
            // then marked as running, which is what a killed run leaves.
            UnfinishedReport.Clear(reports);
            UnfinishedReport.MarkRunning(reports, contractPath, started);
            if (pending is not null) throw pending;
            paths.VerifyInputs();
            return Check(loaded!, samplePath, partials, baseRevision, reports, stdout, stderr);
        }
        catch (GateInputException e)
        {
            UnfinishedReport.MarkFailed(reports, contractPath, started, e);
            throw;
        }
        catch (Exception e) when (e is not OutOfMemoryException)
        {
            UnfinishedReport.MarkStopped(reports, contractPath, started, ErrorCodes.CheckUnfinished,
                $"the check stopped on an internal error ({e.GetType().Name}: {e.Message})", null);
            throw;
        }
    }

    private static int Check(PrecisionContract loaded, string? samplePath, string[]? partials, string? baseRevision, UnfinishedReport.Paths reports,
        TextWriter stdout, TextWriter stderr)
    {
        // Before the sample is read: an unknown base revision stops the run at once.
        var history = SharedOptions.CheckHistory(loaded, baseRevision);
        stdout.WriteLine(history.Note);
        var report = partials is { Length: > 0 }
            ? ContractRun.RunFromPartials(loaded, ShardCommands.Expand(partials))
            : ContractRun.Run(loaded, samplePath, ProgressDisplay.For(stdout, stderr));
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
    public static int Print(RunResult report, string? junitPath, TextWriter stdout, TextWriter stderr)
    {
        stdout.WriteLine($"contract  {report.Contract.FilePath}");
        stdout.WriteLine($"reference {report.ReferencePath} (sha256 {report.ReferenceSha256[..12]}…)");
        stdout.WriteLine($"sample    {string.Join(", ", report.SampleFiles)}");
        stdout.WriteLine();
        stdout.Write(ResultTable.Format(report));
        stdout.WriteLine();
        foreach (var o in report.Outcomes.Where(o => o.Verdict == Verdict.Fail))
            stderr.WriteLine($"{o.Check.Location}: error {CheckEvaluator.DriftCode(o.Check)}: feature '{o.Subject.Name}' {o.Check.Label}: {o.Summary}");
        var severity = report.Contract.Decision.InconclusiveFails ? "error" : "warning";
        foreach (var o in report.Outcomes.Where(o => o.Verdict == Verdict.Inconclusive))
            stderr.WriteLine($"{o.Check.Location}: {severity} {CheckEvaluator.InconclusiveCode}: feature '{o.Subject.Name}' {o.Check.Label} is inconclusive: {o.Summary}; " +
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
        return report.Outcome switch
        {
            RunOutcome.Passed => ExitCodes.Success,
            RunOutcome.Failed => ExitCodes.ChecksFailed,
            _ => ExitCodes.Unaccepted,
        };
    }
}
