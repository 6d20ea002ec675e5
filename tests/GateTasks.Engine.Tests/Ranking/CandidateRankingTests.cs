using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ranking;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Ranking;

/// <summary>
/// The ordering rules on hand-made results: failed checks, then inconclusive checks, then the worst margin; ties
/// share a rank (standard competition ranking, "1224", common practice); candidates not checked come last.
/// </summary>
public class CandidateRankingTests
{
    private static CandidateCheck Check(string name, Verdict verdict, double margin, double noise = double.NaN) =>
        new("x", name, verdict, new Margin(margin, noise));

    private static CandidateResult Result(string name, params CandidateCheck[] checks) =>
        new(name, [name], 1000, checks, checks.All(c => c.Verdict == Verdict.Pass) ? RunOutcome.Passed : RunOutcome.Failed);

    [Fact]
    public void Failed_checks_decide_first_then_inconclusive_checks_then_the_worst_margin()
    {
        var results = new[]
        {
            Result("two-failed", Check("a", Verdict.Fail, -0.5, 0.05), Check("b", Verdict.Fail, -0.4, 0.05)),
            Result("one-failed-high-margin", Check("a", Verdict.Fail, -0.1, 0.05), Check("b", Verdict.Pass, 0.9, 0.05)),
            Result("inconclusive", Check("a", Verdict.Inconclusive, -0.05, 0.05), Check("b", Verdict.Pass, 0.9, 0.05)),
            Result("pass-low", Check("a", Verdict.Pass, 0.2, 0.05), Check("b", Verdict.Pass, 0.9, 0.05)),
            Result("pass-high", Check("a", Verdict.Pass, 0.8, 0.05), Check("b", Verdict.Pass, 0.6, 0.05)),
            Result("one-failed-low-margin", Check("a", Verdict.Fail, -2, 0.05), Check("b", Verdict.Pass, 0.9, 0.05)),
        };
        var ranked = CandidateRanking.Rank(results);

        Assert.Equal(["pass-high", "pass-low", "inconclusive", "one-failed-high-margin", "one-failed-low-margin", "two-failed"],
            ranked.Select(r => r.Result.Candidate));
        Assert.Equal([1, 2, 3, 4, 5, 6], ranked.Select(r => r.Rank!.Value));
        Assert.Equal([RankDecision.First, RankDecision.WorstMargin, RankDecision.InconclusiveChecks, RankDecision.FailedChecks,
            RankDecision.WorstMargin, RankDecision.FailedChecks], ranked.Select(r => r.DecidedBy));
        // The worst margin is the lowest over all checks, whichever check it is.
        Assert.Equal("b", ranked[0].Result.Worst!.Check);
        Assert.Equal(0.6, ranked[0].Result.WorstMargin.Value);
        Assert.Equal("more failed checks than one-failed-low-margin (2 vs 1)", ranked[5].Reason);
        Assert.Equal("as many failed checks as pass-low (0), more inconclusive (1 vs 0)", ranked[2].Reason);
        Assert.Contains("lower worst margin (0.2 vs 0.6, apart by 0.4 > noise 0.07071)", ranked[1].Reason); // √(0.05² + 0.05²) = 0.0707107
    }

    [Fact]
    public void Worst_margins_closer_than_their_noise_tie_and_farther_ones_do_not()
    {
        var ranked = CandidateRanking.Rank([
            Result("a", Check("k", Verdict.Pass, 0.50, 0.03)),
            Result("b", Check("k", Verdict.Pass, 0.46, 0.03)), // 0.04 apart, noise √(0.03² + 0.03²) = 0.0424: a tie
            Result("c", Check("k", Verdict.Pass, 0.30, 0.03)), // 0.16 below b: decided
        ]);
        Assert.Equal([1, 1, 3], ranked.Select(r => r.Rank!.Value));
        Assert.Equal(RankDecision.TieWithinNoise, ranked[1].DecidedBy);
        Assert.Equal("tied with a: same failed (0) and inconclusive (0); worst margins 0.46 and 0.5 differ by 0.04, within their noise 0.04243", ranked[1].Reason);
        Assert.Equal(RankDecision.WorstMargin, ranked[2].DecidedBy);
    }

    [Fact]
    public void A_chain_of_ties_shares_one_rank()
    {
        var ranked = CandidateRanking.Rank([
            Result("a", Check("k", Verdict.Pass, 0.50, 0.03)),
            Result("b", Check("k", Verdict.Pass, 0.46, 0.03)),
            Result("c", Check("k", Verdict.Pass, 0.42, 0.03)), // within noise of b, not of a
            Result("d", Check("k", Verdict.Pass, 0.10, 0.03)),
        ]);
        Assert.Equal([1, 1, 1, 4], ranked.Select(r => r.Rank!.Value));
        Assert.StartsWith("tied with b:", ranked[2].Reason);
    }

    [Fact]
    public void Test_margins_have_no_noise_so_only_equal_ones_tie()
    {
        // Goodness-of-fit margins (1 − level/adjusted p) carry no noise figure: 0.98 and 0.97 are decided.
        var ranked = CandidateRanking.Rank([
            Result("p97", Check("chi2-test", Verdict.Pass, 0.97)),
            Result("p98", Check("chi2-test", Verdict.Pass, 0.98)),
            Result("p98-again", Check("chi2-test", Verdict.Pass, 0.98)),
        ]);
        Assert.Equal(["p98", "p98-again", "p97"], ranked.Select(r => r.Result.Candidate));
        Assert.Equal([1, 1, 3], ranked.Select(r => r.Rank!.Value));
        Assert.Equal(RankDecision.Tie, ranked[1].DecidedBy);
        Assert.Equal(RankDecision.WorstMargin, ranked[2].DecidedBy);
        Assert.DoesNotContain("noise", ranked[2].Reason);
    }

    [Fact]
    public void An_impossible_measurement_is_the_worst_margin_and_two_of_them_tie()
    {
        var ranked = CandidateRanking.Rank([
            Result("impossible-1", Check("k", Verdict.Fail, double.NegativeInfinity), Check("m", Verdict.Fail, -3, 0.1)),
            Result("far", Check("k", Verdict.Fail, -50, 0.1), Check("m", Verdict.Fail, -3, 0.1)),
            Result("impossible-2", Check("k", Verdict.Fail, -1, 0.1), Check("m", Verdict.Fail, double.NegativeInfinity)),
        ]);
        Assert.Equal(["far", "impossible-1", "impossible-2"], ranked.Select(r => r.Result.Candidate));
        Assert.Equal([1, 2, 2], ranked.Select(r => r.Rank!.Value));
        Assert.Equal(RankDecision.Tie, ranked[2].DecidedBy);
        Assert.Equal("m", ranked[2].Result.Worst!.Check);
    }

    [Fact]
    public void Candidates_that_could_not_be_checked_come_last_without_a_rank()
    {
        var broken = CandidateResult.Unchecked("broken", new GateInputException(ErrorCodes.SampleUnreadable, "cannot be read"));
        var ranked = CandidateRanking.Rank([broken, Result("fails", Check("k", Verdict.Fail, -1, 0.1))]);
        Assert.Equal(["fails", "broken"], ranked.Select(r => r.Result.Candidate));
        Assert.Equal([1, null], ranked.Select(r => r.Rank));
        Assert.Equal(RankDecision.NotChecked, ranked[1].DecidedBy);
        Assert.Equal("error", ranked[1].Status);
        Assert.Equal("not checked: GATE2002 cannot be read", ranked[1].Reason);
    }
}
