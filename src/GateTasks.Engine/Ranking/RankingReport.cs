using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Ranking;

/// <summary>The candidates of one ranking run under one contract, best first, those not checked last.</summary>
internal sealed record RankingReport(PrecisionContract Contract, string ReferencePath, IReadOnlyList<RankedCandidate> Candidates)
{
    /// <summary>True when at least one candidate passes the contract.</summary>
    public bool AnyPassed => Candidates.Any(c => c.Result.Passed);

    /// <summary>The candidates that could not be checked.</summary>
    public IReadOnlyList<RankedCandidate> NotChecked => Candidates.Where(c => c.Result.Error is not null).ToList();
}
