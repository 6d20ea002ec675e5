using GateTasks.Engine.Statistics;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// What a pass over a sample (or the merge of its shards) gathered, finished: every exact sum rounded once. Checks,
/// the ledger, reports and references read this; they never see an accumulation while it is being filled.
/// </summary>
internal sealed record AccumulatedSample(
    long Events,
    long NegativeWeightEvents,
    double SumW,
    double SumW2,
    IReadOnlyList<AccumulatedFeature> Features,
    IReadOnlyList<AccumulatedPair> Pairs,
    AccumulatedJointMoments? JointMoments = null,
    SlicedHistograms? Sliced = null);

/// <summary>
/// One feature, finished: its histogram on the reference's axis, unbinned summary, spike tally, far-tail counts, and
/// its weight on the reference's fine grid (for a Wasserstein check).
/// </summary>
internal sealed record AccumulatedFeature(Histogram Histogram, FeatureSummary Summary, SpikeTally? Spike, FarTailCounts? FarTail,
    FineGridCells? FineGrid = null);

/// <summary>
/// One declared pair, finished: Pearson's r, Spearman's ρ (the Pearson correlation of the reference-CDF ranks), the
/// Kish effective count of the pairs used, each coefficient's asymptotic variance n·Var
/// (<see cref="Statistics.WeightedCorrelation.AsymptoticVariance"/>), and its 2-D cells on its <see cref="PairGrid"/>
/// (null only from a pass that gathers none, as a planning or calibration replica).
/// </summary>
internal sealed record AccumulatedPair(CorrelationSpec Spec, double Pearson, double Spearman, double EffectiveCount,
    double PearsonVariance, double SpearmanVariance, CellSums? Cells);

/// <summary>Σw and Σw² of a histogram's cells, each rounded once from its exact sum.</summary>
internal sealed record CellSums(double[] SumW, double[] SumW2);

/// <summary>The joint moments and kernel sums, finished (see <see cref="JointMoments"/>).</summary>
internal sealed record AccumulatedJointMoments(long Rows, long Skipped, BlockedCovariance? Moments, IReadOnlyList<CubicKernelFeatureSums>? Kernel)
{
    /// <summary>
    /// The rows the kernel sums were taken over when they come from the sample's subsample (<see cref="KernelSubsample"/>),
    /// at most K plus ties and all of <see cref="Rows"/> when the sample has no more; null when they cover every row (a reference).
    /// </summary>
    public long? KernelRows { get; init; }

    /// <summary>The subsample's K (null when the kernel sums cover every row).</summary>
    public int? KernelLimit { get; init; }

    /// <summary>Fresh objects holding a state; throws <see cref="FormatException"/> when the numbers do not fit d features.</summary>
    public static AccumulatedJointMoments From(int features, JointMomentsState state)
    {
        var moments = state.Moments is null ? null : new BlockedCovariance(features, JointMoments.Blocks);
        if (moments is not null && !moments.Restore(state.Moments!.ToArray()))
            throw new FormatException($"the joint moments are not of {features} features in {JointMoments.Blocks} blocks");
        CubicKernelFeatureSums[]? kernel = null;
        if (state.Kernel is { } k)
        {
            if (k.Count != JointMoments.Blocks) throw new FormatException($"{k.Count} blocks of joint kernel sums, not {JointMoments.Blocks}");
            kernel = k.Select(s =>
            {
                var sums = new CubicKernelFeatureSums(features);
                return sums.Restore(s.ToArray()) ? sums : throw new FormatException($"joint kernel sums not of {features} features");
            }).ToArray();
        }
        return new AccumulatedJointMoments(state.Rows, state.Skipped, moments, kernel);
    }
}
