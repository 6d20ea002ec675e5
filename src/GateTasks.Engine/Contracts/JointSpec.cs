using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Checks over a declared feature set taken together, so that a broken joint structure fails even when every marginal
/// passes. Two tolerance checks use every event (streamed, weighted, mergeable across shards), each on the features
/// standardised by the reference's weighted means and standard deviations: <see cref="Frechet"/> bounds the Fréchet
/// distance between Gaussian fits, extrapolated to infinite size; <see cref="KernelDistance"/> bounds the unbiased
/// squared maximum mean discrepancy with the cubic polynomial kernel. Each is optional, at least one is stated.
/// </summary>
internal sealed record JointSpec(IReadOnlyList<string> Features, SourceLocation Location)
{
    /// <summary>The widest feature set <c>kernel-distance-max</c> takes: its streamed sums hold C(d+3, 3) numbers a block.</summary>
    public const int MaxKernelFeatures = Statistics.UnbiasedKernelDistance.MaxFeatureMapWidth;

    /// <summary>The bound on the Fréchet distance (<c>frechet-max</c>), or null.</summary>
    public ToleranceCheck? Frechet { get; init; }

    /// <summary>The bound on the unbiased kernel distance (<c>kernel-distance-max</c>), or null.</summary>
    public ToleranceCheck? KernelDistance { get; init; }

    /// <summary>True when a streamed check is stated: every event's moments and kernel sums are gathered.</summary>
    public bool Streams => Frechet is not null || KernelDistance is not null;

    /// <summary>Every check of the block, in report order.</summary>
    public IEnumerable<CheckSpec> Checks
    {
        get
        {
            if (Frechet is not null) yield return Frechet;
            if (KernelDistance is not null) yield return KernelDistance;
        }
    }

    /// <summary>Name used in reports, e.g. <c>joint(e_lead,e_sublead,pt_gg)</c>.</summary>
    public string Name => $"joint({string.Join(",", Features)})";
}
