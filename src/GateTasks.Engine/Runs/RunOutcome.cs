using System;

namespace GateTasks.Engine.Runs;

/// <summary>
/// How one run of a contract ended, decided in one place (<see cref="RunOutcomes.Decide"/>) so that the console, every
/// report, the exit code and the build step say the same. PASSED means every tolerance was shown met and every subject
/// had one, and FAILED that one was shown exceeded: a run that no check failed but some could not decide, or with a
/// subject covered only by goodness-of-fit tests, is UNDECIDED, never PASSED nor FAILED, whatever the contract's
/// inconclusive policy (which decides only whether an undecided run fails the build).
/// </summary>
/// <remarks>Dependency-free: the build step's task compiles this file too.</remarks>
internal enum RunOutcome
{
    /// <summary>Every check passed, every subject had a tolerance check, and the contract and reference in use are the accepted ones.</summary>
    Passed,

    /// <summary>A check failed: a tolerance was shown exceeded.</summary>
    Failed,

    /// <summary>
    /// No check failed and at least one was inconclusive, or a subject (feature, pair, joint block) had goodness-of-fit
    /// tests and no tolerance check: no tolerance was shown missed, but not everything was shown within one. Under <c>decision.inconclusive: fail</c> it fails the build (its GATE3100 messages are errors), under
    /// <c>warn</c> it only warns; the outcome is the same word either way.
    /// </summary>
    Undecided,

    /// <summary>The checks did not fail, but the acceptance ledger does not hold (an unrecorded change, a broken ledger).</summary>
    NotAccepted,

    /// <summary>The run stopped before a verdict: bad input, an internal error, or a process that was stopped.</summary>
    DidNotFinish,
}

/// <summary>The rule that decides a run's outcome, and the words it is shown with.</summary>
internal static class RunOutcomes
{
    /// <summary>
    /// The outcome of a finished run: a failed check fails it; a broken ledger makes the rest NOT ACCEPTED; inconclusive
    /// checks, or subjects covered only by goodness-of-fit tests (<paramref name="uncovered"/>: their readings are
    /// diagnostics, which neither pass nor fail anything), make it UNDECIDED (the contract's inconclusive policy says
    /// only whether that fails the build, not what the run is called: FAILED always means a tolerance was exceeded).
    /// </summary>
    public static RunOutcome Decide(int failures, int inconclusive, bool acceptanceHolds, int uncovered = 0)
    {
        if (failures > 0) return RunOutcome.Failed;
        if (!acceptanceHolds) return RunOutcome.NotAccepted;
        return inconclusive > 0 || uncovered > 0 ? RunOutcome.Undecided : RunOutcome.Passed;
    }

    /// <summary>The stamp for titles and summary lines: PASSED, FAILED, UNDECIDED, NOT ACCEPTED, DID NOT FINISH.</summary>
    public static string Word(this RunOutcome outcome) => outcome switch
    {
        RunOutcome.Passed => "PASSED",
        RunOutcome.Failed => "FAILED",
        RunOutcome.Undecided => "UNDECIDED",
        RunOutcome.NotAccepted => "NOT ACCEPTED",
        _ => "DID NOT FINISH",
    };

    /// <summary>The lower-case token for machine-read attributes and records: passed, failed, undecided, not-accepted, did-not-finish.</summary>
    public static string Token(this RunOutcome outcome) => outcome switch
    {
        RunOutcome.Passed => "passed",
        RunOutcome.Failed => "failed",
        RunOutcome.Undecided => "undecided",
        RunOutcome.NotAccepted => "not-accepted",
        _ => "did-not-finish",
    };

    /// <summary>The outcome a <see cref="Token"/> names; null for any other text.</summary>
    public static RunOutcome? FromToken(string? token)
    {
#if NET5_0_OR_GREATER
        // The generic form: it needs no run-time code generation (the tool is compiled ahead of time).
        foreach (var o in Enum.GetValues<RunOutcome>())
#else
        foreach (RunOutcome o in Enum.GetValues(typeof(RunOutcome)))
#endif
            if (string.Equals(o.Token(), token, StringComparison.Ordinal)) return o;
        return null;
    }
}
