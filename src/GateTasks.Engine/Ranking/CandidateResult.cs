using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// What ranking keeps of one candidate's check: verdict counts and every check's margin, not the histograms, so
/// memory does not grow with the number of candidates beyond a few numbers per check. A candidate that could not
/// be checked carries its <see cref="Error"/> and no checks.
/// </summary>
internal sealed record CandidateResult(
    string Candidate,
    IReadOnlyList<string> SampleFiles,
    long Events,
    IReadOnlyList<CandidateCheck> Checks,
    RunOutcome Outcome,
    CandidateError? Error = null)
{
    /// <summary>The run's global score (the joint block's Fréchet distance ± its error), or why there is none.</summary>
    public GlobalScore Score { get; init; } = GlobalScore.NoJointBlock;

    /// <summary>True when every check passed (the ledger aside: ranking compares fidelity).</summary>
    public bool Passed => Outcome == RunOutcome.Passed;

    /// <summary>Number of failed checks.</summary>
    public int Failed => Checks.Count(c => c.Verdict == Verdict.Fail);

    /// <summary>Number of inconclusive checks.</summary>
    public int Inconclusive => Checks.Count(c => c.Verdict == Verdict.Inconclusive);

    /// <summary>The check with the lowest margin (the first in contract order among equals); null without checks.</summary>
    public CandidateCheck? Worst => Checks.Count == 0 ? null : Checks.MinBy(c => RankValue(c.Margin));

    /// <summary>The worst margin: −∞ when a measurement was impossible, +∞ when there is no check at all.</summary>
    public Margin WorstMargin => Worst?.Margin ?? new Margin(double.PositiveInfinity, double.NaN);

    /// <summary>A margin as ranked: NaN (which no check should produce) counts as the worst possible.</summary>
    public static double RankValue(Margin m) => double.IsNaN(m.Value) ? double.NegativeInfinity : m.Value;

    /// <summary>Keeps what ranking needs of a check report.</summary>
    public static CandidateResult FromReport(string candidate, RunResult report) =>
        new(candidate, report.SampleFiles, report.Events,
            report.Outcomes.Select(o => new CandidateCheck(o.Subject.Name, o.Check.Label, o.Verdict, Margin.Of(o, report.Contract.Decision))).ToList(),
            report.ChecksOutcome) { Score = report.Score };

    /// <summary>A candidate whose check stopped on bad input.</summary>
    public static CandidateResult Unchecked(string candidate, GateInputException e) =>
        new(candidate, [], 0, [], RunOutcome.DidNotFinish, CandidateError.From(e)) { Score = GlobalScore.Absent("not checked") };
}
