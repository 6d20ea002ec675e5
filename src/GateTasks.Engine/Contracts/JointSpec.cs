using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Checks over a declared feature set taken together, so that a broken joint structure fails even when every marginal
/// passes. Two tolerance checks use the events with their weights (streamed, mergeable across shards; the kernel
/// distance's sample side a seeded subsample of at most <see cref="KernelRows"/> events), each on the features
/// standardised by the reference's weighted means and standard deviations: <see cref="Frechet"/> bounds the Fréchet
/// distance between Gaussian fits, extrapolated to infinite size; <see cref="KernelDistance"/> bounds the unbiased
/// squared maximum mean discrepancy with the cubic polynomial kernel; <see cref="Sliced"/> bound the worst and mean
/// projected Kolmogorov–Smirnov and Wasserstein-1 distances over <see cref="Projections"/> fixed directions. Each
/// is optional, at least one is stated.
/// </summary>
internal sealed record JointSpec(IReadOnlyList<string> Features, SourceLocation Location)
{
    /// <summary>The widest feature set <c>kernel-distance-max</c> takes: its streamed sums hold C(d+3, 3) numbers a block.</summary>
    public const int MaxKernelFeatures = Statistics.UnbiasedKernelDistance.MaxFeatureMapWidth;

    /// <summary>The bound on the Fréchet distance (<c>frechet-max</c>), or null.</summary>
    public ToleranceCheck? Frechet { get; init; }

    /// <summary>The bound on the unbiased kernel distance (<c>kernel-distance-max</c>), or null.</summary>
    public ToleranceCheck? KernelDistance { get; init; }

    /// <summary>Sample rows the kernel distance is computed on when the contract states no <c>kernel-rows</c>.</summary>
    public const int DefaultKernelRows = 50_000;

    /// <summary>
    /// The fewest and most sample rows <c>kernel-rows</c> takes. Below 1 000 the 16 block estimates hold too few rows
    /// to estimate the spread. Above 200 000 the subsample's store (2K entries of d + 3 numbers: 115 MB at the widest
    /// kernel block, d = 32; 74 MB at d = 20), its share of a partial file and the final pass through the feature map
    /// (C(d+3, 3) multiply-adds a row: about 1 s at d = 32) stop being small beside the stream itself.
    /// </summary>
    public const int MinKernelRows = 1_000, MaxKernelRows = 200_000;

    /// <summary>K: the most sample rows (plus rows tying the last) the kernel distance is computed on (<c>kernel-rows</c>).</summary>
    public int KernelRows { get; init; } = DefaultKernelRows;

    /// <summary>True when a streamed check is stated: every event's moments and the kernel's sums (the sample's over its subsample) are gathered.</summary>
    public bool Streams => Frechet is not null || KernelDistance is not null;

    /// <summary>Directions of the sliced checks when the contract states none.</summary>
    public const int DefaultProjections = 64;

    /// <summary>The fewest and most directions <c>projections</c> takes (memory and the bootstrap grow with K).</summary>
    public const int MinProjections = 4, MaxProjections = 256;

    /// <summary>The sliced tolerances (<c>sliced-ks-max</c>, <c>sliced-wasserstein-max</c>: worst and/or mean), in report order.</summary>
    public IReadOnlyList<SlicedToleranceCheck> Sliced { get; init; } = [];

    /// <summary>The number K of fixed directions the sliced checks project on.</summary>
    public int Projections { get; init; } = DefaultProjections;

    /// <summary>True when a sliced check is stated: every event's projections are histogrammed on the reference's grids.</summary>
    public bool Slices => Sliced.Count > 0;

    /// <summary>True when the reference's means and standard deviations of the joint features are needed (streamed or sliced checks).</summary>
    public bool Standardises => Streams || Slices;

    /// <summary>Every check of the block, in report order.</summary>
    public IEnumerable<CheckSpec> Checks
    {
        get
        {
            if (Frechet is not null) yield return Frechet;
            if (KernelDistance is not null) yield return KernelDistance;
            foreach (var s in Sliced) yield return s;
        }
    }

    /// <summary>Name used in reports, e.g. <c>joint(e_lead,e_sublead,pt_gg)</c>.</summary>
    public string Name => $"joint({string.Join(",", Features)})";
}
