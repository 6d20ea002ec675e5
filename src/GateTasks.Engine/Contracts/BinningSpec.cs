using System.Globalization;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// A feature's binning request as the contract states it, one of four shapes that each carry only what they need:
/// <see cref="QuantileBinning"/>, <see cref="UniformBinning"/>, <see cref="EdgeBinning"/> and
/// <see cref="CategoryBinning"/>. <see cref="Location"/> points at the request (or at the feature's name when it
/// has none of its own).
/// </summary>
internal abstract record BinningSpec(SourceLocation Location)
{
    /// <summary>
    /// Canonical text of the request. The reference stores it, and a check refuses a reference
    /// built from another request, so a binning edit cannot go unnoticed.
    /// </summary>
    public abstract string Canonical { get; }
}

/// <summary>Equal-probability bins from the reference's own quantiles.</summary>
internal sealed record QuantileBinning(int Bins, SourceLocation Location) : BinningSpec(Location)
{
    /// <inheritdoc />
    public override string Canonical => $"quantile:{Bins}";
}

/// <summary>Equal-width bins over a stated range [<paramref name="Lower"/>, <paramref name="Upper"/>).</summary>
internal sealed record UniformBinning(int Bins, double Lower, double Upper, SourceLocation Location) : BinningSpec(Location)
{
    /// <inheritdoc />
    public override string Canonical => string.Create(CultureInfo.InvariantCulture, $"uniform:{Bins}:{Lower:R}:{Upper:R}");
}

/// <summary>Edges written out in the contract, strictly increasing, at least two.</summary>
internal sealed record EdgeBinning(IReadOnlyList<double> Edges, SourceLocation Location) : BinningSpec(Location)
{
    /// <inheritdoc />
    public override string Canonical => "edges:" + string.Join(",", Edges.Select(e => e.ToString("R", CultureInfo.InvariantCulture)));
}

/// <summary>One bin per integer value seen in the reference (discrete features, and a category block's fractions).</summary>
internal sealed record CategoryBinning(SourceLocation Location) : BinningSpec(Location)
{
    /// <inheritdoc />
    public override string Canonical => "categories";
}
