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
    public static Command Create(CommandOutput output)
    {
        var contract = SharedOptions.Contract();
        var sample = SharedOptions.Sample();
        var junit = new Option<string?>("--junit")
        {
            HelpName = "FILE",
            Description = "Also write a JUnit XML report to this path.",
        }.NotEmpty();
        var text = new Option<string?>("--text")
        {
            HelpName = "FILE",
            Description = "Also write the result table and summary as plain text to this path.",
        }.NotEmpty();
        var html = new Option<string?>("--html")
        {
            HelpName = "FILE",
            Description = "Also write a self-contained HTML report with a plot per feature to this path.",
        }.NotEmpty();
        var markdown = new Option<string?>("--markdown")
        {
            HelpName = "FILE",
            Description = "Also write a Markdown summary (for a pull-request comment or CI job summary) to this path.",
        }.NotEmpty();
        var plots = new Option<string?>("--plots")
        {
            HelpName = "DIR",
            Description = "Also write each feature's plot and each declared pair's 2-D map as a standalone SVG file into this folder (created if new).",
        }.NotEmpty();
        var json = SharedOptions.Json("check");
        var allChecks = new Option<bool>("--all-checks")
        {
            Description = "Print the full table of checks (failures and undecided first) instead of the compact summary: verdict, counts, binding checks, failures.",
        };
        var partials = new Option<string[]>("--partials")
        {
            HelpName = "FILES",
            Description = "Decide from partial files (from 'gatetasks fill' on shards of the sample, or 'gatetasks merge') instead of reading a sample.",
            AllowMultipleArgumentsPerToken = true,
        }.NotEmpty();
        var baseRevision = SharedOptions.BaseRevision();
        var command = new Command("check", "Check a surrogate sample against the reference under the contract's tolerances. Exit 0: passed; 1: a check failed; 2: input error; 4: not accepted (the contract, reference or ledger in use is not the accepted state; see the ledger errors); 5: undecided (no check failed, some could not decide).")
        {
            contract, sample, junit, text, html, markdown, json, allChecks, plots, partials, baseRevision,
        };
        command.SetAction(parse => CliApp.Guard(output, () =>
            Run(parse.GetValue(contract)!, parse.GetValue(sample), parse.GetValue(partials), parse.GetValue(baseRevision),
                new UnfinishedReport.Paths(parse.GetValue(junit), parse.GetValue(text), parse.GetValue(html), parse.GetValue(markdown), parse.GetValue(json)),
                parse.GetValue(allChecks), output, parse.GetValue(plots))));
        return command;
    }

    private static int Run(string contractPath, string? samplePath, string[]? partials, string? baseRevision, UnfinishedReport.Paths reports,
        bool allChecks, CommandOutput output, string? plots)
    {
        // A run that reaches no verdict says so on the record stream; the console says it with the error line alone.
        var finished = false;
        try
        {
            var exit = Execute(contractPath, samplePath, partials, baseRevision, reports, allChecks, output, plots);
            finished = true;
            return exit;
        }
        finally
        {
            if (!finished) output.Outcome(RunOutcome.DidNotFinish);
            Announce(reports, output);
        }
    }

    // The reports a run leaves (its own, or the "did not finish" form), each a record for the build step.
    private static void Announce(UnfinishedReport.Paths reports, CommandOutput output)
    {
        (string Kind, string? Path)[] all = [("junit", reports.JUnit), ("text", reports.Text), ("html", reports.Html), ("markdown", reports.Markdown), ("json", reports.Json)];
        foreach (var (kind, path) in all)
            if (path is not null && File.Exists(path)) output.Report(kind, path);
    }

    private static int Execute(string contractPath, string? samplePath, string[]? partials, string? baseRevision, UnfinishedReport.Paths reports,
        bool allChecks, CommandOutput output, string? plots)
    {
        var started = DateTimeOffset.UtcNow;
        // Every file the check reads, found without reading any at length; an input error here is held until the
        // reports are cleared, so that it is what they say.
        var paths = new RunPaths().Write(reports.JUnit, "--junit").Write(reports.Text, "--text").Write(reports.Html, "--html")
            .Write(reports.Markdown, "--markdown").Write(reports.Json, "--json").Read(contractPath, "the contract");
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
            // The plots folder must be a folder; its files, named from the contract, are outputs like the reports.
            if (plots is not null)
            {
                PlotFolder.VerifyFolder(plots);
                if (loaded is not null) foreach (var file in PlotFolder.Paths(loaded, plots)) paths.Write(file, $"--plots file '{Path.GetFileName(file)}'");
            }
            paths.VerifyOutputs();
        }
        catch (GateInputException e)
        {
            string? Safe(string? path) => paths.CanWriteAlone(path) ? path : null;
            var others = new UnfinishedReport.Paths(Safe(reports.JUnit), Safe(reports.Text), Safe(reports.Html), Safe(reports.Markdown), Safe(reports.Json));
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
            // Made before the sample is read, so a folder that cannot be stops the run at once.
            if (plots is not null) PlotFolder.Create(plots);
            return Check(loaded!, samplePath, partials, baseRevision, reports, allChecks, output, plots);
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
        bool allChecks, CommandOutput output, string? plots)
    {
        // Before the sample is read: an unknown base revision stops the run at once.
        var history = SharedOptions.CheckHistory(loaded, baseRevision);
        output.Note(history.Note);
        var report = partials is { Length: > 0 }
            ? ContractRun.RunFromPartials(loaded, ShardCommands.Expand(partials))
            : ContractRun.Run(loaded, samplePath, ProgressDisplay.For(output));
        if (history.Finding is { } finding) report = report with { Acceptance = [finding, .. report.Acceptance] };
        if (reports.Text is { } textPath)
            // The verdict stays the last line: the score, information beside it, comes before.
            AtomicFile.WriteText(textPath, ResultTable.Format(report) + Environment.NewLine + ResultTable.ScoreLine(report) + Environment.NewLine +
                ResultTable.Summary(report) + Environment.NewLine);
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
        if (plots is not null)
            written.Add($"plots: {PlotFolder.Write(report, plots).Count} SVG files in {Path.GetFullPath(plots)}");
        if (reports.Json is { } jsonPath)
        {
            ResultJson.Write(jsonPath, report);
            written.Add($"JSON result: {Path.GetFullPath(jsonPath)}");
        }
        var exit = Print(report, reports.JUnit, output, allChecks);
        foreach (var line in written) output.Detail(line);
        return exit;
    }

    /// <summary>
    /// Prints the run: the files compared, the full table when <paramref name="allChecks"/>, one coded message per
    /// failed then undecided check, the verdict line with the counts and, right under it, the binding checks; writes
    /// the JUnit report.
    /// </summary>
    public static int Print(RunResult report, string? junitPath, CommandOutput output, bool allChecks = false)
    {
        output.Detail($"contract  {report.Contract.FilePath}");
        output.Detail($"reference {report.ReferencePath} (sha256 {report.ReferenceSha256[..12]}…)");
        output.Detail($"sample    {string.Join(", ", report.SampleFiles)}");
        output.Out.WriteLine();
        var table = allChecks ? ResultTable.Format(report) : ResultTable.Compact(report);
        if (table.Length > 0)
        {
            output.DetailBlock(table);
            output.Out.WriteLine();
        }
        foreach (var d in RunDiagnostics.Of(report)) output.Diagnostic(d);
        // NaN and ±∞ the contract allows are still counted, and said.
        foreach (var c in report.Comparisons.Where(c => c.SurrogateSummary.NonFiniteCount > 0))
            output.Detail($"note: feature '{c.Spec.Name}' has {c.SurrogateSummary.NanCount} NaN, {c.SurrogateSummary.PositiveInfinityCount} +∞ and " +
                          $"{c.SurrogateSummary.NegativeInfinityCount} −∞ in the surrogate sample, counted apart (non-finite: allow).");
        if (junitPath is not null)
        {
            JUnitReport.Write(junitPath, [report]);
            output.Detail($"JUnit report: {Path.GetFullPath(junitPath)}");
        }
        // Just above the verdict line, not a verdict: a note (the build step shows it at normal verbosity).
        output.Note(ResultTable.ScoreLine(report));
        if (!allChecks) output.Detail($"The table of all {report.Outcomes.Count} checks, with each one's share of its tolerance: --all-checks (or --text FILE, --html FILE, --json FILE).");
        output.Summary(ResultTable.Summary(report));
        if (!report.AcceptanceHolds)
            output.Summary($"NOT ACCEPTED: {report.Acceptance.Count(f => f.IsError)} ledger error(s) above; the contract or reference in use is not the accepted one.");
        var binding = BindingChecks.Of(report);
        if (binding.Count > 0)
        {
            // Notes, not summaries: the verdict stays the one summary line (the build step logs notes at normal verbosity).
            output.Note(BindingChecks.Heading(binding.Count));
            foreach (var (o, h) in binding) output.Note("  " + BindingChecks.Line(o, h));
        }
        output.Outcome(report.Outcome);
        return ExitCode(report.Outcome);
    }

    /// <summary>The exit code of a finished run's outcome (docs/cli.md).</summary>
    public static int ExitCode(RunOutcome outcome) => outcome switch
    {
        RunOutcome.Passed => ExitCodes.Success,
        RunOutcome.Failed => ExitCodes.ChecksFailed,
        RunOutcome.Undecided => ExitCodes.Undecided,
        RunOutcome.NotAccepted => ExitCodes.Unaccepted,
        _ => ExitCodes.InternalError,
    };
}
