using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ranking;
using GateTasks.Tests.Shared;
using Xunit.Abstractions;

namespace GateTasks.Engine.Tests.Ranking;

/// <summary>Ranking real checks of demo checkpoints: the order the drifts imply, ties, and candidates that cannot be read.</summary>
public sealed class RankingRunTests(CheckpointSet set, ITestOutputHelper output) : IClassFixture<CheckpointSet>
{
    private PrecisionContract Contract => ContractLoader.Load(set.ContractPath);

    [Fact]
    public void Five_checkpoints_are_ranked_in_the_order_of_their_drift()
    {
        // Given in epoch order, which is not the order of quality.
        var report = RankingRun.Run(Contract, [.. Enumerable.Range(1, 5).Select(set.Epoch)]);
        output.WriteLine(RankingTable.Format(report));

        Assert.Equal(CheckpointSet.ExpectedOrder.Select(set.Epoch), report.Candidates.Select(c => c.Result.Candidate));
        Assert.Equal([1, 2, 3, 4, 5], report.Candidates.Select(c => c.Rank!.Value));
        Assert.Equal(["pass", "pass", "fail", "fail", "fail"], report.Candidates.Select(c => c.Status));
        // The two passing epochs are told apart by their worst margins, the failing ones by how many checks failed.
        Assert.Equal([RankDecision.First, RankDecision.WorstMargin, RankDecision.FailedChecks, RankDecision.FailedChecks, RankDecision.FailedChecks],
            report.Candidates.Select(c => c.DecidedBy));

        // The order is not luck of the seeds: each deciding difference is far beyond its noise. The passing pair's
        // worst margins are apart by more than 4σ of their difference, and each failing epoch's failures are
        // shown at least 4σ past their tolerance (margin ≤ −4·noise), more of them the stronger the drift.
        var (best, mild) = (report.Candidates[0].Result, report.Candidates[1].Result);
        var gap = best.WorstMargin.Value - mild.WorstMargin.Value;
        var noise = CandidateRanking.DifferenceNoise(best.WorstMargin, mild.WorstMargin)!.Value;
        Assert.True(gap > 4 * noise, $"worst margins {best.WorstMargin} and {mild.WorstMargin}");
        Assert.True(mild.WorstMargin.Value > 4 * mild.WorstMargin.Noise, $"the mild epoch passes with room: {mild.WorstMargin}");
        var clearFailures = report.Candidates.Skip(2).Select(c => c.Result.Checks.Count(k => k.Margin.Value < -4 * k.Margin.Noise)).ToList();
        for (var i = 0; i + 1 < clearFailures.Count; i++)
            Assert.True(clearFailures[i + 1] > report.Candidates[2 + i].Result.Checks.Count(k => k.Margin.Value < 0),
                $"epoch ranked {3 + i + 1} has {clearFailures[i + 1]} clear failures, not more than the checks outside tolerance of the one above");

        // Every candidate names the check with the lowest margin.
        foreach (var c in report.Candidates)
            Assert.Equal(c.Result.Checks.Min(k => k.Margin.Value), c.Result.Worst!.Margin.Value);
    }

    [Fact]
    public void Two_identical_candidates_tie_and_share_a_rank()
    {
        var copy = Path.Combine(set.Folder, "epoch-4-copy.parquet");
        File.Copy(set.Epoch(4), copy, overwrite: true);
        var report = RankingRun.Run(Contract, [set.Epoch(5), copy, set.Epoch(4)]);
        output.WriteLine(RankingTable.Format(report));

        Assert.Equal([copy, set.Epoch(4), set.Epoch(5)], report.Candidates.Select(c => c.Result.Candidate)); // the tie keeps the order given
        Assert.Equal([1, 1, 3], report.Candidates.Select(c => c.Rank!.Value));
        Assert.Equal(RankDecision.Tie, report.Candidates[1].DecidedBy);
        Assert.True(report.Candidates[1].TiedWithPrevious);
        Assert.StartsWith($"tied with {copy}", report.Candidates[1].Reason);
        Assert.Equal(RankDecision.WorstMargin, report.Candidates[2].DecidedBy);
    }

    [Fact]
    public void A_candidate_that_cannot_be_read_is_listed_last_with_its_error_and_the_others_are_still_ranked()
    {
        var broken = Path.Combine(set.Folder, "epoch-6.parquet");
        File.WriteAllText(broken, "not a parquet file");
        var noJets = Path.Combine(set.Folder, "epoch-7.csv");
        File.WriteAllLines(noJets, ["m_gg,e_lead,weight", "95,60,1", "96,61,1"]);
        var report = RankingRun.Run(Contract, [broken, set.Epoch(5), noJets, set.Epoch(4)]);
        output.WriteLine(RankingTable.Format(report));

        Assert.Equal([set.Epoch(4), set.Epoch(5), broken, noJets], report.Candidates.Select(c => c.Result.Candidate));
        Assert.Equal([1, 2, null, null], report.Candidates.Select(c => c.Rank));
        Assert.Equal(ErrorCodes.SampleUnreadable, report.Candidates[2].Result.Error!.Code);
        Assert.Equal(ErrorCodes.ContractUnknownColumn, report.Candidates[3].Result.Error!.Code);
        Assert.Contains("n_jets", report.Candidates[3].Result.Error!.Message);
        Assert.All(report.Candidates.Skip(2), c => Assert.Equal(RankDecision.NotChecked, c.DecidedBy));
        Assert.Equal(2, report.NotChecked.Count);
        Assert.True(report.AnyPassed);
    }

    [Fact]
    public void A_missing_reference_stops_the_run_instead_of_failing_every_candidate()
    {
        var path = Path.Combine(set.Folder, "missing-reference.yaml");
        File.WriteAllText(path, CheckpointSet.ContractText.Replace("reference: reference.parquet", "reference: nowhere.parquet"));
        var e = Assert.Throws<GateInputException>(() => RankingRun.Run(ContractLoader.Load(path), [set.Epoch(4), set.Epoch(5)]));
        Assert.Equal(ErrorCodes.ReferenceNotFound, e.Code);
    }
}
