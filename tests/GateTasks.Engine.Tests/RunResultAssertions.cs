using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests;

/// <summary>
/// What these tests asserted as "passed" before a run had one outcome: no check fails the run (none failed and, where
/// the contract counts inconclusive checks as failing, none is inconclusive). An UNDECIDED run counts.
/// </summary>
internal static class RunResultAssertions
{
    public static bool NoCheckFailed(this RunResult result) => result.ChecksOutcome != RunOutcome.Failed;
}
