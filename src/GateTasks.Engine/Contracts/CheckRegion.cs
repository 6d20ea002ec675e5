namespace GateTasks.Engine.Contracts;

/// <summary>
/// The part of a feature's distribution a regional check looks at: the whole, the core, the tails, or a region the
/// feature declares. <see cref="Name"/> is as written in contracts (<c>all</c>, <c>core</c>, <c>tails</c> or the
/// declared name).
/// </summary>
internal sealed record CheckRegion
{
    private CheckRegion(Region kind, string name) => (Kind, Name) = (kind, name);

    /// <summary>Which kind of region this is.</summary>
    public Region Kind { get; }

    /// <summary>The region's name as written in contracts.</summary>
    public string Name { get; }

    /// <summary>The whole distribution.</summary>
    public static CheckRegion All { get; } = new(Region.All, "all");

    /// <summary>The core, between two reference quantiles.</summary>
    public static CheckRegion Core { get; } = new(Region.Core, ContractKeys.Core);

    /// <summary>Everything outside the core.</summary>
    public static CheckRegion Tails { get; } = new(Region.Tails, ContractKeys.Tails);

    /// <summary>A region the feature declares under <c>regions:</c>.</summary>
    public static CheckRegion Declared(string name) => new(Region.Named, name);
}
