namespace GateTasks.Engine.Planning;

/// <summary>
/// A contract's sample-size plan: each check's plan, the surrogate size at which a perfect surrogate passes the whole
/// contract at the target rate (null when some check never does), the rate simulated there with its noise, the size
/// the detectable drifts are stated at, and what was simulated how.
/// </summary>
internal sealed record SampleSizePlan(
    IReadOnlyList<PlannedCheck> Checks,
    long? ContractEvents,
    double ContractPassRate,
    double ContractPassRateNoise,
    long DetectionEvents,
    double Target,
    double Power,
    int Replicas,
    long ReferenceEvents,
    IReadOnlyList<string> NotPlanned);
