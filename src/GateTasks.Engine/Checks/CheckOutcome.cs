using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Checks;

/// <summary>
/// One check's verdict: what it was made on (a feature, a pair or the joint block), its <see cref="Measurement"/>, its
/// p-value after the contract-wide correction, and the level that p-value was compared with.
/// </summary>
internal sealed record CheckOutcome(
    CheckSubject Subject,
    CheckSpec Check,
    Measurement Measured,
    Verdict Verdict,
    double AdjustedPValue,
    double Level)
{
    /// <summary>For an inconclusive check, the surrogate events that would decide it (<see cref="NeededEvents"/>); else null.</summary>
    public NeededEvents? Needed { get; init; }

    /// <summary>The estimate (effect checks) or statistic (tests).</summary>
    public double Value => Measured.Estimate;

    /// <summary>One-line reason, for messages.</summary>
    public string Summary => Measured.Summary;

    /// <summary>Named numbers for reports.</summary>
    public IReadOnlyList<KeyValuePair<string, string>> Details => Measured.Details;
}
