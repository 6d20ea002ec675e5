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
    /// Undecided: no check failed, but some were inconclusive and the contract lets that only warn, so not every
    /// tolerance was shown met. Not 0, which says every tolerance was shown met; not 1, which says one was missed.
    /// </summary>
    public const int Undecided = 5;
}
