namespace GateTasks.Engine.Ranking;

/// <summary>What placed a candidate where it is, relative to the candidate just above it.</summary>
internal enum RankDecision
{
    /// <summary>The top candidate: nothing above it.</summary>
    First,

    /// <summary>More failed checks than the one above.</summary>
    FailedChecks,

    /// <summary>As many failed checks, more inconclusive ones.</summary>
    InconclusiveChecks,

    /// <summary>Equal counts, a higher global score by more than the scores' noise, or no global score where the one above has one.</summary>
    GlobalScore,

    /// <summary>Equal counts and global scores (or neither has one), a lower worst margin, by more than the margins' noise.</summary>
    WorstMargin,

    /// <summary>Equal on every key: same rank as the one above.</summary>
    Tie,

    /// <summary>Equal counts and global scores, or worst margins, closer than their noise: same rank as the one above.</summary>
    TieWithinNoise,

    /// <summary>Could not be checked: listed after every checked candidate, without a rank.</summary>
    NotChecked,
}
