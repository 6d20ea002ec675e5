namespace GateTasks.Engine.Drafting;

/// <summary>
/// One drafted feature: a column, the kind inferred from its profile (with the reason), a spike where one value holds a
/// large share, and its tolerances by check key (ratio-max by region), each with its derivation. A column not worth
/// checking (constant, no finite value, excluded) has a <see cref="SkipReason"/> and no checks; <see cref="Dropped"/> lists
/// checks left out because the reference's own noise allows no tolerance for them.
/// </summary>
internal sealed record FeatureDraft(
    string Column,
    Contracts.FeatureKind Kind,
    string KindReason,
    double? Spike,
    string? SpikeReason,
    IReadOnlyList<(Contracts.CheckKind Check, string? Region, DraftedTolerance Tolerance)> Tolerances,
    string? SkipReason,
    IReadOnlyList<string>? Dropped = null);
