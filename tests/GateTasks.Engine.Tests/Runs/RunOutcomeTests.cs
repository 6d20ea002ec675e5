using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Runs;

/// <summary>
/// The one rule that decides a run's outcome, against the documented rule (docs/cli.md, exit codes; README): PASSED
/// only when every tolerance was shown met and the ledger holds,
/// FAILED only when one was shown exceeded (an undecided run is UNDECIDED under either inconclusive policy).
/// </summary>
public class RunOutcomeTests
{
    [Theory]
    [InlineData(0, 0, true, "Passed")]
    [InlineData(1, 0, true, "Failed")]
    [InlineData(1, 2, false, "Failed")] // a failed check outranks a broken ledger
    [InlineData(0, 2, true, "Undecided")] // not every tolerance shown met, none shown missed: whatever the inconclusive policy
    [InlineData(0, 2, false, "NotAccepted")]
    [InlineData(0, 0, false, "NotAccepted")]
    public void A_run_is_decided_in_one_place(int failures, int inconclusive, bool acceptanceHolds, string expected) =>
        Assert.Equal(Enum.Parse<RunOutcome>(expected), RunOutcomes.Decide(failures, inconclusive, acceptanceHolds));

    [Theory]
    [InlineData(0, 0, true, 1, "Undecided")] // a subject covered only by goodness-of-fit tests: nothing shows it within a tolerance
    [InlineData(1, 0, true, 1, "Failed")]
    [InlineData(0, 0, false, 1, "NotAccepted")]
    [InlineData(0, 0, true, 0, "Passed")]
    public void A_subject_covered_only_by_tests_keeps_a_run_from_passing(int failures, int inconclusive, bool acceptanceHolds, int uncovered, string expected) =>
        Assert.Equal(Enum.Parse<RunOutcome>(expected), RunOutcomes.Decide(failures, inconclusive, acceptanceHolds, uncovered));

    [Fact]
    public void Every_outcome_has_its_word_and_a_token_that_reads_back()
    {
        Assert.Equal(["PASSED", "FAILED", "UNDECIDED", "NOT ACCEPTED", "DID NOT FINISH"], Enum.GetValues<RunOutcome>().Select(o => o.Word()));
        foreach (var o in Enum.GetValues<RunOutcome>()) Assert.Equal(o, RunOutcomes.FromToken(o.Token()));
        Assert.Null(RunOutcomes.FromToken("PASSED"));
    }
}
