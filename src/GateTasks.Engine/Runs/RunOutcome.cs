namespace GateTasks.Engine.Runs;

/// <summary>
/// How one run of a contract ended, decided in one place (<see cref="RunResult.Outcome"/>) so that the console, every
/// report and the exit code say the same: a run whose checks pass while the ledger does not hold is not a pass.
/// </summary>
internal enum RunOutcome
{
    /// <summary>Every check passed and the contract and reference in use are the accepted ones.</summary>
    Passed,

    /// <summary>A check failed (or was inconclusive, where the contract counts that as failing).</summary>
    Failed,

    /// <summary>The checks passed, but the acceptance ledger does not hold (an unrecorded change, a broken ledger).</summary>
    NotAccepted,
}

/// <summary>The words a run's outcome is shown with.</summary>
internal static class RunOutcomeText
{
    /// <summary>The stamp for titles and summary lines: PASSED, FAILED or NOT ACCEPTED.</summary>
    public static string Word(this RunOutcome outcome) => outcome switch
    {
        RunOutcome.Passed => "PASSED",
        RunOutcome.Failed => "FAILED",
        _ => "NOT ACCEPTED",
    };

    /// <summary>The lower-case token for machine-read attributes: passed, failed, not-accepted.</summary>
    public static string Token(this RunOutcome outcome) => outcome switch
    {
        RunOutcome.Passed => "passed",
        RunOutcome.Failed => "failed",
        _ => "not-accepted",
    };
}
