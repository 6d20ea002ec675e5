using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// One feature of the contract with its resolved binning, core and checks (defaults applied). A declared
/// <see cref="Spike"/> value (0 for an absent object, a padding sentinel) is counted on its own; the histogram and
/// every continuous check see only the other values. A derived feature has an <see cref="Expression"/> over columns
/// instead of a column (<see cref="ColumnLocation"/> then points at the expression).
/// </summary>
internal sealed record FeatureSpec(
    string Name,
    string Column,
    FeatureKind Kind,
    BinningSpec Binning,
    CoreSpec Core,
    IReadOnlyList<CheckSpec> Checks,
    SourceLocation Location,
    SourceLocation ColumnLocation,
    double? Spike = null,
    string? Expression = null,
    IReadOnlyList<NamedRegion>? Regions = null,
    SelectionSpec? Condition = null)
{
    /// <summary>
    /// Whether NaN and infinite values of this feature in the surrogate sample are allowed (counted apart: NaN outside
    /// every cell, ±∞ in the flow cells, neither in the moments); by default they fail the check with GATE2008.
    /// </summary>
    public bool AllowNonFinite { get; init; }

    /// <summary>Where the feature's (or the defaults') <c>non-finite</c> setting stands; the feature's name when unset.</summary>
    public SourceLocation? NonFiniteLocation { get; init; }

    /// <summary>
    /// For a category of a category block with <c>share-scaling</c>: how its inherited tolerances widen with its share
    /// of the events (applied once the reference is read, <c>References/CategoryTolerances</c>); null otherwise.
    /// </summary>
    public ShareScaling? ShareScaling { get; init; }

    /// <summary>For a category of a category block: its <see cref="Condition"/> in parts; null otherwise.</summary>
    public CategoryCondition? Category { get; init; }

    /// <summary>
    /// Whether the reference keeps, and the sample gathers, the fine equal-probability grid of this feature: a
    /// continuous feature whose Wasserstein-1 distance is integrated on it or whose quantiles are read off it (coarse
    /// bins give a quantile's density only as a bin's average, which for a falling tail is far from its value there).
    /// </summary>
    public bool NeedsFineGrid => FineGridCheck is not null;

    /// <summary>The first check that reads the fine grid (<see cref="NeedsFineGrid"/>), named when a reference lacks the grid.</summary>
    public CheckSpec? FineGridCheck =>
        Kind == FeatureKind.Continuous ? Enumerable.FirstOrDefault(Checks, c => c.Kind is CheckKind.Wasserstein or CheckKind.QuantileShift) : null;

    /// <summary>
    /// What the reference must have been built for: the binning request and, when declared, the spike value. A
    /// check refuses a reference built for anything else.
    /// </summary>
    public string ReferenceRequest =>
        Binning.Canonical
        + (Spike is { } v ? "|spike:" + v.ToString("R", System.Globalization.CultureInfo.InvariantCulture) : "")
        + (Expression is { } e ? "|expression:" + e : "")
        + (Condition is { } c ? "|condition:" + c.Text : "");
}
