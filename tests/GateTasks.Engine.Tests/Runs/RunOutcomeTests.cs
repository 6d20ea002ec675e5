using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Runs;

/// <summary>
/// The one rule that decides a run's outcome, against the documented rule (docs/cli.md, exit codes; README): PASSED
/// only when every tolerance was shown met and the ledger holds.
/// </summary>
public class RunOutcomeTests
{
    [Theory]
    [InlineData(0, 0, true, true, "Passed")]
    [InlineData(0, 0, false, true, "Passed")]
    [InlineData(1, 0, false, true, "Failed")]
    [InlineData(1, 2, false, false, "Failed")] // a failed check outranks a broken ledger
    [InlineData(0, 2, true, true, "Failed")] // inconclusive: fail
    [InlineData(0, 2, false, true, "Undecided")] // inconclusive: warn — not every tolerance shown met
    [InlineData(0, 2, false, false, "NotAccepted")]
    [InlineData(0, 0, true, false, "NotAccepted")]
    public void A_run_is_decided_in_one_place(int failures, int inconclusive, bool inconclusiveFails, bool acceptanceHolds, string expected) =>
        Assert.Equal(Enum.Parse<RunOutcome>(expected), RunOutcomes.Decide(failures, inconclusive, inconclusiveFails, acceptanceHolds));

    [Fact]
    public void Every_outcome_has_its_word_and_a_token_that_reads_back()
    {
        Assert.Equal(["PASSED", "FAILED", "UNDECIDED", "NOT ACCEPTED", "DID NOT FINISH"], Enum.GetValues<RunOutcome>().Select(o => o.Word()));
        foreach (var o in Enum.GetValues<RunOutcome>()) Assert.Equal(o, RunOutcomes.FromToken(o.Token()));
        Assert.Null(RunOutcomes.FromToken("PASSED"));
    }
}
