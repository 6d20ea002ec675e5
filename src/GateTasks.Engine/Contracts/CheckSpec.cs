using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// One required check with its tolerance. <see cref="Limit"/> is the tolerance, an upper bound on the effect size;
/// NaN for goodness-of-fit tests, which have none.
/// <see cref="Location"/> points at the tolerance in the contract (a feature's own or a default).
/// </summary>
internal sealed record CheckSpec(CheckKind Kind, Region Region, double Limit, SourceLocation Location, string? Named = null)
{
    /// <summary>Where a named region's key stands in the tolerance mapping (for "no such region" errors).</summary>
    public SourceLocation? NamedKeyLocation { get; init; }

    /// <summary>True for goodness-of-fit tests: no tolerance, only a p-value in the contract's family.</summary>
    public bool IsTest => Kind is CheckKind.ChiSquareTest or CheckKind.KolmogorovSmirnovTest or CheckKind.AndersonDarlingTest or CheckKind.CramerVonMisesTest or CheckKind.EnergyTest or CheckKind.ChiSquare2DTest;

    /// <summary>The contract key that states this check.</summary>
    public string Key => ContractKeys.CheckKey(Kind);

    /// <summary>Short label, e.g. <c>ratio-max[core]</c>.</summary>
    public string Label => Region == Region.All ? Key : $"{Key}[{RegionName}]";

    /// <summary>Lower-case region name as written in contracts.</summary>
    public string RegionName => Region switch
    {
        Region.Core => "core",
        Region.Tails => "tails",
        Region.Named => Named ?? "named",
        _ => "all",
    };
}
