using System.Collections.Generic;
using System.Globalization;
using System.IO;
using System.Linq;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Runs;
using Microsoft.Build.Framework;

namespace GateTasks.MSBuild;

/// <summary>
/// Checks each contract with the GateTasks engine (<c>gatetasks check</c>) in its own process and turns the records it
/// writes (<see cref="RunRecord"/>) into MSBuild errors and warnings at the contract's file, line and column, with their
/// codes, and into the one-line verdict. Reads no text of the engine's console.
/// </summary>
public sealed class GateRun : EngineTask
{
    /// <summary>The project being built: where an error without a place of its own (a wrong GateSample) is shown.</summary>
    public string? ProjectFile { get; set; }

    /// <summary>
    /// Git revision whose acceptance ledger each contract's ledger must extend; empty: the engine's default (a CI
    /// system's pull-request base, else none).
    /// </summary>
    public string? BaseRevision { get; set; }

    /// <summary>Report failed and inconclusive checks (and the ratchet) as warnings instead of errors.</summary>
    public bool FailuresAsWarnings { get; set; }

    /// <summary>True when every contract's run PASSED: every tolerance shown met, the ledger holding.</summary>
    [Output]
    public bool Passed { get; private set; }

    /// <inheritdoc />
    public override bool Execute()
    {
        var contracts = ContractPaths();
        var bases = ReportBases(contracts);
        if (!File.Exists(Engine))
        {
            const string missing = "The GateTasks engine is missing at '{0}'; the package is incomplete. Restore it again or reinstall GateTasks.";
            Log.LogError(null, "GATE0011", null, ErrorCodeHelpLink.For("GATE0011"), null, 0, 0, 0, 0, missing, Engine);
            for (var i = 0; i < contracts.Count; i++)
                TaskUnfinishedReport.Write(ReportItems(contracts[i], bases[i]), contracts[i], "GATE0011", string.Format(CultureInfo.InvariantCulture, missing, Engine));
            return false;
        }
        var allPassed = true;
        for (var i = 0; i < contracts.Count; i++)
        {
            if (Cancelled) return false;
            allPassed &= Check(contracts[i], bases[i]) == RunOutcome.Passed;
        }
        Passed = allPassed && !Log.HasLoggedErrors;
        return !Log.HasLoggedErrors;
    }

    private RunOutcome Check(string contract, string reportBase)
    {
        var planned = ReportItems(contract, reportBase).ToList();
        string PathOf(string kind) => planned.First(r => r.GetMetadata("Kind") == kind).ItemSpec;
        // --all-checks: the full table goes to the detailed log, as before; the verdict and the binding checks under it are logged at every verbosity.
        var args = new List<string> { "check", "--contract", contract, "--all-checks", "--junit", PathOf("junit"), "--text", PathOf("text"), "--html", PathOf("html"), "--markdown", PathOf("markdown") };
        AddSample(args);
        if (!string.IsNullOrWhiteSpace(BaseRevision)) args.AddRange(new[] { "--base-revision", BaseRevision!.Trim() });

        var run = RunEngine(args, out var startError);
        if (run is null)
        {
            Log.LogError(null, "GATE0013", null, ErrorCodeHelpLink.For("GATE0013"), null, 0, 0, 0, 0, "{0}", startError);
            return Unfinished(contract, planned, "GATE0013", startError!);
        }
        var read = Read(run.Records);
        if (run.Records.Count == 0)
            foreach (var line in run.Console) Log.LogMessage(MessageImportance.Low, "{0}", line);

        var outcome = Verdict(run.Exit, read);
        if (outcome is null)
        {
            if (run.Exit == -1)
                return Unfinished(contract, planned, "GATE0013", Cancelled ? "the build was cancelled while the check ran" : "the GateTasks engine could not be started");
            var message = string.Format(CultureInfo.InvariantCulture,
                "The GateTasks engine stopped with exit code {0} without saying why; run 'dotnet \"{1}\" check --contract \"{2}\"' to see its output.",
                run.Exit, Engine, contract);
            Log.LogError(null, "GATE0012", null, ErrorCodeHelpLink.For("GATE0012"), contract, 0, 0, 0, 0, "{0}", message);
            return Unfinished(contract, planned, "GATE0012", message);
        }
        if (outcome == RunOutcome.DidNotFinish)
            Log.LogMessage(MessageImportance.High, "{0}: the check of {1} stopped before a verdict (see the error above); its reports say so.", outcome.Value.Word(), contract);
        return outcome.Value;
    }

    /// <summary>
    /// The run's outcome when the exit code agrees with what the engine recorded (docs/cli.md: 0 passed, 1 failed,
    /// 4 not accepted, 5 undecided; 2 stopped on an input error it reported); null when it does not: the engine ended
    /// in a way that leaves its reports in doubt.
    /// </summary>
    private static RunOutcome? Verdict(int exit, Recorded read) => (exit, read.Outcome) switch
    {
        (0, RunOutcome.Passed) => RunOutcome.Passed,
        (1, RunOutcome.Failed) => RunOutcome.Failed,
        (4, RunOutcome.NotAccepted) => RunOutcome.NotAccepted,
        (5, RunOutcome.Undecided) => RunOutcome.Undecided,
        (2, RunOutcome.DidNotFinish or null) when read.ErrorLogged => RunOutcome.DidNotFinish,
        _ => null,
    };

    /// <summary>
    /// The engine did not start, was stopped, or died without a word: it may have written nothing, so no report of an
    /// earlier run may stay to say PASSED.
    /// </summary>
    private static RunOutcome Unfinished(string contract, List<ITaskItem> planned, string code, string message)
    {
        TaskUnfinishedReport.Write(planned, contract, code, message);
        return RunOutcome.DidNotFinish;
    }

    private sealed class Recorded
    {
        public RunOutcome? Outcome;
        public bool ErrorLogged;
    }

    /// <summary>Logs every record at its place and level, and keeps the outcome (report records are not needed here).</summary>
    private Recorded Read(IReadOnlyList<RunRecord> records)
    {
        var read = new Recorded();
        foreach (var record in records)
        {
            switch (record.Type)
            {
                case RunRecord.DiagnosticType:
                    read.ErrorLogged |= LogDiagnostic(record);
                    break;
                case RunRecord.TextType:
                    // The one-line verdict at every verbosity; progress and the ledger history ("not checked" must not go
                    // unseen) at normal; the table and the rest at detailed.
                    var importance = record.Level switch
                    {
                        RunRecord.SummaryLevel => MessageImportance.High,
                        RunRecord.NoteLevel => MessageImportance.Normal,
                        _ => MessageImportance.Low,
                    };
                    Log.LogMessage(importance, "{0}", record.Text);
                    break;
                case RunRecord.OutcomeType:
                    read.Outcome = RunOutcomes.FromToken(record.Outcome);
                    break;
            }
        }
        return read;
    }

    /// <summary>Logs a coded message as an MSBuild error or warning at its place; true when it is an error.</summary>
    private bool LogDiagnostic(RunRecord d)
    {
        var kind = DiagnosticKindTokens.FromToken(d.Kind) ?? DiagnosticKind.Setup;
        var isError = d.Severity != "warning";
        // A message without a place would be shown at this package's targets file; the project is where the settings
        // are (GateSample above all, which the message then names).
        var file = d.File ?? (string.IsNullOrEmpty(ProjectFile) ? null : ProjectFile);
        var message = d.File is null && !string.IsNullOrWhiteSpace(Sample) && kind == DiagnosticKind.Sample
            ? d.Text + " (the sample named by the GateSample property)"
            : d.Text;
        // Warn-only mode turns fidelity failures into warnings; set-up, input and ledger errors stay errors.
        if (!isError || (kind.IsFidelity() && FailuresAsWarnings))
        {
            Log.LogWarning(null, d.Code, null, ErrorCodeHelpLink.For(d.Code), file, d.Line, d.Column, 0, 0, "{0}", message);
            return false;
        }
        Log.LogError(null, d.Code, null, ErrorCodeHelpLink.For(d.Code), file, d.Line, d.Column, 0, 0, "{0}", message);
        return true;
    }
}
