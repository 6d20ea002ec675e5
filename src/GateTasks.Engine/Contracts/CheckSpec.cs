using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// One required check as the contract states it, in one of three shapes that each carry only what that kind of check
/// has: <see cref="ToleranceCheck"/> (an effect size bounded by a tolerance), <see cref="RegionToleranceCheck"/>
/// (the same over one region of the distribution) and <see cref="GoodnessOfFitTest"/> (no tolerance, only a p-value:
/// a diagnostic beside the verdict, never part of it). <see cref="Location"/> points at the tolerance (or the test's <c>on</c>) in the
/// contract, a feature's own or a default.
/// </summary>
internal abstract record CheckSpec(CheckKind Kind, SourceLocation Location)
{
    /// <summary>The contract key that states this check.</summary>
    public string Key => ContractKeys.CheckKey(Kind);

    /// <summary>Lower-case name of the region the check looks at, as written in contracts: <c>all</c> unless it has a region.</summary>
    public virtual string RegionName => CheckRegion.All.Name;

    /// <summary>Short label, e.g. <c>ratio-max[core]</c>; the key alone for a check over the whole distribution.</summary>
    public virtual string Label => Key;
}

/// <summary>A check whose effect size must stay below <paramref name="Tolerance"/> (positive, finite) over the whole distribution.</summary>
internal record ToleranceCheck(CheckKind Kind, double Tolerance, SourceLocation Location) : CheckSpec(Kind, Location);

/// <summary>
/// A tolerance check over one <paramref name="Region"/> of the distribution (<see cref="ContractKeys.HasRegions"/>).
/// <paramref name="RegionLocation"/> is where the region is named in the contract: the key of a tolerance mapping, or
/// the tolerance itself when it covers the whole distribution.
/// </summary>
internal sealed record RegionToleranceCheck(CheckKind Kind, CheckRegion Region, double Tolerance, SourceLocation Location, SourceLocation RegionLocation)
    : ToleranceCheck(Kind, Tolerance, Location)
{
    /// <summary>A regional check whose region is named where its tolerance stands.</summary>
    public RegionToleranceCheck(CheckKind kind, CheckRegion region, double tolerance, SourceLocation location)
        : this(kind, region, tolerance, location, location)
    {
    }

    /// <inheritdoc />
    public override string RegionName => Region.Name;

    /// <inheritdoc />
    public override string Label => Region.Kind == Contracts.Region.All ? Key : $"{Key}[{Region.Name}]";
}

/// <summary>
/// A goodness-of-fit test: no tolerance, so it is no check of the verdict. A run reads it beside the verdict as
/// "distinguishable at this size" or not (its p-value adjusted over the contract's tests alone); it never passes or
/// fails anything, and a subject it alone covers leaves the run undecided.
/// </summary>
internal sealed record GoodnessOfFitTest(CheckKind Kind, SourceLocation Location) : CheckSpec(Kind, Location);
