using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// Checks each candidate sample under one contract, one after another (each check's histograms are dropped before
/// the next starts, so memory stays that of one check), and ranks them with <see cref="CandidateRanking"/>.
/// </summary>
internal static class RankingRun
{
    /// <summary>
    /// Runs the contract on every candidate (a file, folder or glob, relative to the working directory, as
    /// <c>check --sample</c> takes it). A candidate whose sample is bad (unreadable, empty, missing a column) is
    /// kept, unranked, with its error, and the others are still ranked. A problem that is not the candidate's own
    /// (the reference is missing, unreadable or does not fit the contract) would be the same for every candidate
    /// and stops the run. <paramref name="checkedOne"/> is told of each candidate as it finishes (index, result).
    /// </summary>
    public static RankingReport Run(PrecisionContract contract, IReadOnlyList<string> candidates, Action<int, CandidateResult>? checkedOne = null)
    {
        var results = new List<CandidateResult>(candidates.Count);
        for (var i = 0; i < candidates.Count; i++)
        {
            CandidateResult result;
            try
            {
                result = CandidateResult.FromReport(candidates[i], ContractRun.Run(contract, candidates[i]));
            }
            catch (GateInputException e) when (!IsCommonToAll(e.Code))
            {
                result = CandidateResult.Unchecked(candidates[i], e);
            }
            results.Add(result);
            checkedOne?.Invoke(i, result);
        }
        return new RankingReport(contract, contract.ReferenceFullPath, CandidateRanking.Rank(results));
    }

    /// <summary>Reference problems (GATE21xx) and unwritable outputs: the same for every candidate.</summary>
    private static bool IsCommonToAll(string code) =>
        code is ErrorCodes.ReferenceNotFound or ErrorCodes.ReferenceUnreadable or ErrorCodes.ReferenceMismatch or ErrorCodes.OutputNotWritable;
}
