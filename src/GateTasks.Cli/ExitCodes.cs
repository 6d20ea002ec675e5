namespace GateTasks.Cli;

/// <summary>Process exit codes; documented in docs/cli.md.</summary>
internal static class ExitCodes
{
    /// <summary>Every check passed: every tolerance was shown met (or the command succeeded).</summary>
    public const int Success = 0;

    /// <summary>At least one check failed: the surrogate drifted outside its tolerances.</summary>
    public const int ChecksFailed = 1;

    /// <summary>Usage or input error: bad arguments, contract, sample or reference. Nothing was judged.</summary>
    public const int InputError = 2;

    /// <summary>
    /// The checks passed but the accepted state was not respected: the ledger is broken, or a tolerance, check or
    /// reference changed without an accepted entry, or the ratchet caught a degraded margin.
    /// </summary>
    public const int Unaccepted = 4;

    /// <summary>An internal error (a bug in GateTasks); nothing was judged.</summary>
    public const int InternalError = 3;

    /// <summary>
    /// Undecided: no check failed, but some were inconclusive (whatever the contract's inconclusive policy) or a subject
    /// had no tolerance check, so not every tolerance was shown met. Not 0, which says every tolerance was shown met;
    /// not 1, which says one was missed.
    /// </summary>
    public const int Undecided = 5;

    /// <summary>Every exit code with its one-line meaning, as the root's <c>--help</c> lists them.</summary>
    public static readonly IReadOnlyList<(int Code, string Meaning)> Meanings =
    [
        (Success, "PASSED: every tolerance was shown met (other commands: done)."),
        (ChecksFailed, "FAILED: a check showed a tolerance exceeded (rank: no candidate passes; calibrate: a false-alarm rate above the contract's level)."),
        (InputError, "Usage or input error (arguments, contract, sample, reference, ledger); nothing was judged."),
        (InternalError, "Internal error, a bug in GateTasks; nothing was judged."),
        (Unaccepted, "NOT ACCEPTED: no check failed, but the contract, reference or ledger in use is not the accepted state."),
        (Undecided, "UNDECIDED: no check failed, but some could not decide, so not every tolerance was shown met."),
    ];
}
