using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// A tolerance of a joint block's <c>sliced-ks-max</c> or <c>sliced-wasserstein-max</c> on one summary of the K
/// projected distances: the worst over the projections (<paramref name="Mean"/> false) or their mean. The summary is
/// the check's region in reports (<c>sliced-ks-max[worst]</c>), so the two tolerances of one key are two checks.
/// </summary>
internal sealed record SlicedToleranceCheck(CheckKind Kind, bool Mean, double Tolerance, SourceLocation Location)
    : ToleranceCheck(Kind, Tolerance, Location)
{
    /// <inheritdoc />
    public override string RegionName => Mean ? ContractKeys.Mean : ContractKeys.Worst;

    /// <inheritdoc />
    public override string Label => $"{Key}[{RegionName}]";
}
