using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>One feature of the contract with its resolved binning, core and checks (defaults applied).</summary>
internal sealed record FeatureSpec(
    string Name,
    string Column,
    FeatureKind Kind,
    BinningSpec Binning,
    CoreSpec Core,
    IReadOnlyList<CheckSpec> Checks,
    SourceLocation Location,
    SourceLocation ColumnLocation);
