using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>The coded messages of a finished run, in the order the console shows them.</summary>
internal static class RunDiagnostics
{
    /// <summary>
    /// One per failed check (its drift code), one per inconclusive check (GATE3100: an error where the contract says
    /// inconclusive fails, else a warning, with the events that would decide it), one per subject covered only by
    /// goodness-of-fit tests (GATE3021, the same severity: the run is undecided), then the ledger's findings. A test's
    /// reading is no coded message: it is a diagnostic beside the verdict, in the tables.
    /// </summary>
    public static IEnumerable<Diagnostic> Of(RunResult report)
    {
        var decision = report.Contract.Decision;
        foreach (var o in report.Outcomes.Where(o => o.Verdict == Verdict.Fail))
            yield return Diagnostic.Error(CheckEvaluator.DriftCode(o.Check), CheckSentence.Of(o, decision), o.Check.Location);
        var severity = decision.InconclusiveFails ? DiagnosticSeverity.Error : DiagnosticSeverity.Warning;
        foreach (var o in report.Outcomes.Where(o => o.Verdict == Verdict.Inconclusive))
            yield return new Diagnostic(CheckEvaluator.InconclusiveCode, severity, o.Check.Location, CheckSentence.Of(o, decision));
        foreach (var s in report.UncoveredSubjects)
            yield return new Diagnostic(ErrorCodes.SubjectWithoutTolerance, severity, s.Location, UncoveredText(s));
        foreach (var f in report.Acceptance) yield return f.Diagnostic;
    }

    /// <summary>Why a subject covered only by goodness-of-fit tests leaves the run undecided.</summary>
    public static string UncoveredText(Contracts.CheckSubject s) =>
        $"'{s.Name}' has goodness-of-fit tests and no tolerance check: a test says only whether the samples are distinguishable " +
        "at this size, not whether they agree within a tolerance, so nothing shows it within one and the run is undecided; add a tolerance check";
}
