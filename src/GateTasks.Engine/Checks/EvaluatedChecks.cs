namespace GateTasks.Engine.Checks;

/// <summary>
/// Every check of a contract decided: per feature what was compared (for plots), each tolerance check's outcome in
/// contract order, and each goodness-of-fit test's reading (beside the verdict, not part of it), in contract order.
/// </summary>
internal sealed record EvaluatedChecks(IReadOnlyList<FeatureComparison> Comparisons, IReadOnlyList<CheckOutcome> Outcomes)
{
    /// <summary>The goodness-of-fit tests' readings (<see cref="TestReadingRule"/>).</summary>
    public IReadOnlyList<TestReading> Readings { get; init; } = [];

    /// <summary>The run's global score (<see cref="GlobalScore"/>): information, never part of the verdict.</summary>
    public GlobalScore Score { get; init; } = GlobalScore.NoJointBlock;
}
