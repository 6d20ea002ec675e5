using GateTasks.Engine.Statistics;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// A <see cref="SampleAccumulation"/>'s whole state as plain numbers, every exact sum as its terms: what a partial
/// file stores, so that shards filled apart add up to the bits of one pass.
/// </summary>
internal sealed record AccumulationState(
    long Events,
    long NegativeWeightEvents,
    IReadOnlyList<double> SumW,
    IReadOnlyList<double> SumW2,
    IReadOnlyList<FeatureState> Features,
    IReadOnlyList<PairState> Pairs,
    JointMomentsState? JointMoments = null,
    SlicedState? Sliced = null);

/// <summary>
/// One feature's state: its exact histogram, its statistics (<see cref="FeatureStatistics.State"/>), spike tally,
/// far-tail sums and fine-grid cells.
/// </summary>
internal sealed record FeatureState(string Name, ExactHistogramState Histogram, IReadOnlyList<double> Statistics, SpikeState? Spike,
    IReadOnlyList<IReadOnlyList<double>>? FarTail, FineGridState? FineGrid = null);

/// <summary>A spike tally's state: entries, and Σw and Σw² as their exact terms.</summary>
internal sealed record SpikeState(long Entries, IReadOnlyList<double> SumW, IReadOnlyList<double> SumW2);

/// <summary>A pair's state: the Pearson and Spearman accumulators' numbers, and the 2-D cells when its χ² is asked for.</summary>
internal sealed record PairState(string Name, IReadOnlyList<double> Pearson, IReadOnlyList<double> Spearman, ExactCellsState? Cells);

/// <summary>
/// A <see cref="JointMoments"/> state as numbers: rows taken in and skipped, the <see cref="BlockedCovariance.State"/>
/// (null when not gathered), each block's <see cref="CubicKernelFeatureSums.State"/> over every row (a reference's;
/// null when not gathered) and the sample's kernel subsample (<see cref="KernelSubsample.State"/>; null when not
/// gathered or when the kernel sums cover every row).
/// </summary>
internal sealed record JointMomentsState(long Rows, long Skipped, IReadOnlyList<double>? Moments, IReadOnlyList<IReadOnlyList<double>>? Kernel,
    KernelSubsampleState? KernelSubsample = null);

/// <summary>
/// The rows a <see cref="KernelSubsample"/> keeps: its K and row width, and per entry (rows of equal values, canonical
/// order) the raw joint values (<paramref name="Width"/> a row, concatenated), how many rows share them, and the exact
/// terms of their Σw and Σw² (<see cref="Statistics.ExactSum.Terms"/>).
/// </summary>
internal sealed record KernelSubsampleState(int Limit, int Width, IReadOnlyList<double> Values, IReadOnlyList<long> Counts,
    IReadOnlyList<IReadOnlyList<double>> WeightTerms, IReadOnlyList<IReadOnlyList<double>> SquareTerms);

/// <summary>
/// A joint block's sliced histograms as numbers: the <see cref="SlicedGrid.Digest"/> of the grid they were filled on
/// and the counter's exact sums (<see cref="SlicedHistogramCounter.State"/>).
/// </summary>
internal sealed record SlicedState(string GridDigest, SlicedHistogramState Histograms);
