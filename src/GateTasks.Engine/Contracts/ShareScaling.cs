using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// A category block's rule that widens the tolerances a category inherits from its feature as the category gets
/// smaller: by √(<paramref name="FullShare"/>/share), at least 1 and at most <paramref name="AtMost"/>, share being
/// the category's share of the reference's weight (known once the reference is read). A tolerance holds as written
/// for a category with at least <paramref name="FullShare"/> of the events; an effect's noise grows as 1/√events, so a
/// category with a quarter of that share gets twice the tolerance. Checks in <paramref name="Own"/> (by label) have a
/// tolerance stated for the category itself and are not scaled.
/// </summary>
internal sealed record ShareScaling(double FullShare, double AtMost, SourceLocation Location, IReadOnlySet<string> Own)
{
    /// <summary>The factor for a category holding <paramref name="share"/> of the events.</summary>
    public double Factor(double share) => share > 0 ? Math.Clamp(Math.Sqrt(FullShare / share), 1, AtMost) : AtMost;
}
