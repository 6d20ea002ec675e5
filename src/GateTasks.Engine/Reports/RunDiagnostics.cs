using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>The coded messages of a finished run, in the order the console shows them.</summary>
internal static class RunDiagnostics
{
    /// <summary>
    /// One per failed check (its drift code), one per inconclusive check (GATE3100: an error where the contract says
    /// inconclusive fails, else a warning, with the events that would decide it), then the ledger's findings.
    /// </summary>
    public static IEnumerable<Diagnostic> Of(RunResult report)
    {
        foreach (var o in report.Outcomes.Where(o => o.Verdict == Verdict.Fail))
            yield return Diagnostic.Error(CheckEvaluator.DriftCode(o.Check), $"feature '{o.Subject.Name}' {o.Check.Label}: {o.Summary}", o.Check.Location);
        var severity = report.Contract.Decision.InconclusiveFails ? DiagnosticSeverity.Error : DiagnosticSeverity.Warning;
        foreach (var o in report.Outcomes.Where(o => o.Verdict == Verdict.Inconclusive))
            yield return new Diagnostic(CheckEvaluator.InconclusiveCode, severity, o.Check.Location,
                $"feature '{o.Subject.Name}' {o.Check.Label} is inconclusive: {o.Summary}; " + UndecidedReason.Of(o));
        foreach (var f in report.Acceptance) yield return f.Diagnostic;
    }
}
