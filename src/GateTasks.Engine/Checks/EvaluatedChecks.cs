namespace GateTasks.Engine.Checks;

/// <summary>Every check of a contract decided: per feature what was compared (for plots), and each check's outcome in contract order.</summary>
internal sealed record EvaluatedChecks(IReadOnlyList<FeatureComparison> Comparisons, IReadOnlyList<CheckOutcome> Outcomes);
