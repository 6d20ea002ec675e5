namespace GateTasks.Engine.Contracts;

/// <summary>Part of a feature's distribution that a check looks at.</summary>
internal enum Region
{
    /// <summary>The whole distribution.</summary>
    All,

    /// <summary>The bulk, between two quantiles of the reference (for discrete features: the most populated categories).</summary>
    Core,

    /// <summary>Everything outside the core, on both sides.</summary>
    Tails,

    /// <summary>A region the feature declares by name (<see cref="CheckRegion.Declared"/>).</summary>
    Named,
}
