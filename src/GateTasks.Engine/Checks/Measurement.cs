namespace GateTasks.Engine.Checks;

/// <summary>
/// What one check measured, before the contract-wide decision. For an effect check: the estimate, its confidence
/// bounds at the contract's confidence, and the p-value of "the effect is within tolerance". For a
/// goodness-of-fit test: its statistic (as <see cref="Estimate"/>) and p-value of "the same distribution"; bounds NaN.
/// </summary>
internal sealed record Measurement(
    double Estimate,
    double Lower,
    double Upper,
    double PValue,
    string Summary,
    IReadOnlyList<KeyValuePair<string, string>> Details)
{
    /// <summary>
    /// The effect's parts with their standard errors (effect checks built on <see cref="EffectIntersection"/>); empty
    /// for the rest. <see cref="NeededEvents"/> solves the events needed to decide from them.
    /// </summary>
    public IReadOnlyList<EffectPart> Parts { get; init; } = [];

    /// <summary>For a ks-max check, its band's make-up (<see cref="NeededEvents"/> sizes it in closed form); else null.</summary>
    public KsBand? Band { get; init; }

    /// <summary>The events the sample parts of <see cref="Parts"/>' errors (or of <see cref="Band"/>) were measured on (a category's own events for a category feature).</summary>
    public long PartsEvents { get; init; }

    /// <summary>
    /// True when the effect could not be computed from these histograms: nothing was measured, so nothing can be
    /// decided — the check is inconclusive with its reason as the summary, and its p-value (NaN) carries no evidence.
    /// </summary>
    public bool Uncomputable { get; init; }

    /// <summary>A measurement that cannot be made (e.g. an empty region): undecided, with its reason; never a p-value of 0.</summary>
    public static Measurement Impossible(string why, IReadOnlyList<KeyValuePair<string, string>> details) =>
        new(double.NaN, double.NaN, double.NaN, double.NaN, "cannot be computed: " + why, details) { Uncomputable = true };
}
