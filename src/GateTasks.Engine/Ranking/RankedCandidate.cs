using GateTasks.Engine.Runs;
namespace GateTasks.Engine.Ranking;

/// <summary>
/// A candidate in its place: its rank (shared by tied candidates; null when it could not be checked), the key that
/// decided its place against the candidate above, and that reason in words.
/// </summary>
internal sealed record RankedCandidate(int? Rank, CandidateResult Result, RankDecision DecidedBy, string Reason)
{
    /// <summary>Where the candidate was given on the command line (0 first): the order of the score plot.</summary>
    public int Given { get; init; }

    /// <summary>True when it shares its rank with the candidate above.</summary>
    public bool TiedWithPrevious => DecidedBy is RankDecision.Tie or RankDecision.TieWithinNoise;

    /// <summary>"pass", "undecided", "fail" or "error" (not checked).</summary>
    public string Status => Result.Error is not null ? "error" : Result.Outcome switch
    {
        RunOutcome.Passed => "pass",
        RunOutcome.Undecided => "undecided",
        _ => "fail",
    };

    /// <summary>The <see cref="DecidedBy"/> key as written in the CSV and JSON reports.</summary>
    public string DecidedByKey => DecidedBy switch
    {
        RankDecision.First => "first",
        RankDecision.FailedChecks => "failed",
        RankDecision.InconclusiveChecks => "inconclusive",
        RankDecision.GlobalScore => "global-score",
        RankDecision.WorstMargin => "worst-margin",
        RankDecision.Tie => "tie",
        RankDecision.TieWithinNoise => "tie-within-noise",
        _ => "not-checked",
    };
}
