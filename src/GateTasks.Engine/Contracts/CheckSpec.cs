using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// One required check with its tolerance. <see cref="Limit"/> is an upper bound on the measured value,
/// except for <see cref="CheckKind.ChiSquare"/> where it is a floor on the p-value.
/// <see cref="Location"/> points at the tolerance in the contract (a feature's own or a default).
/// </summary>
internal sealed record CheckSpec(CheckKind Kind, Region Region, double Limit, SourceLocation Location)
{
    /// <summary>True when the check passes with a measured value at or below the limit.</summary>
    public bool LimitIsMaximum => Kind != CheckKind.ChiSquare;

    /// <summary>The contract key that states this check.</summary>
    public string Key => ContractKeys.CheckKey(Kind);

    /// <summary>Short label, e.g. <c>ratio-max[core]</c>.</summary>
    public string Label => Region == Region.All ? Key : $"{Key}[{RegionName}]";

    /// <summary>Lower-case region name as written in contracts.</summary>
    public string RegionName => Region switch
    {
        Region.Core => "core",
        Region.Tails => "tails",
        _ => "all",
    };
}
