using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// The declared pairs of one stream: one <see cref="PairColumn"/> per feature in any pair, prepared once per batch,
/// then each pair's fill (<see cref="PairCorrelation"/>) from those columns. A feature in k pairs is searched once,
/// not 2k times (its cell for the 2-D grid and its rank for Spearman's coefficient).
/// </summary>
internal sealed class PairAccumulation
{
    private readonly PairColumn[] _columns;

    /// <param name="pairs">The declared pairs.</param>
    /// <param name="index">Each feature's index in a batch.</param>
    /// <param name="reference">The reference's histogram of a feature (by index): its axis and marginal CDF.</param>
    public PairAccumulation(IReadOnlyList<CorrelationSpec> pairs, IReadOnlyDictionary<string, int> index, Func<int, Histogram> reference)
    {
        var columns = new Dictionary<int, PairColumn>();
        PairColumn Column(int feature)
        {
            if (!columns.TryGetValue(feature, out var column)) columns[feature] = column = new PairColumn(feature, new MarginalCdf(reference(feature)));
            return column;
        }
        Pairs = pairs.Select(p =>
        {
            var (first, second) = (Column(index[p.First]), Column(index[p.Second]));
            return new PairCorrelation(p, first, second, PairGrid.For(p, first.Axis, second.Axis));
        }).ToList();
        _columns = columns.Values.ToArray();
    }

    /// <summary>Rows from which a batch's columns, pairs and lanes are spread over threads.</summary>
    private const int ParallelRows = 8192;

    /// <summary>The pairs, in declared order.</summary>
    public IReadOnlyList<PairCorrelation> Pairs { get; }

    /// <summary>
    /// Adds a batch to every pair, on up to <paramref name="parallelism"/> threads: the columns side by side, then the
    /// pairs' cells side by side, then the lanes' groups side by side. Each step writes only its own column's, pair's or
    /// group's state, so the numbers do not depend on the threads.
    /// </summary>
    public void Add(Samples.FeatureView view, int parallelism = 1)
    {
        // A small batch stays on the calling thread (as the stream keeps its visits of small batches on one).
        var options = new ParallelOptions { MaxDegreeOfParallelism = view.Rows < ParallelRows ? 1 : Math.Max(1, parallelism) };
        Parallel.ForEach(_columns, options, column => column.Prepare(view));
        // Pairs of unit weight without NaN leave their values' and ranks' co-moments to the lanes, four at a time.
        var laned = new bool[Pairs.Count];
        Parallel.For(0, Pairs.Count, options, p => laned[p] = Pairs[p].AddPrepared(view, PairMomentLanes.Supported));
        var lanes = new List<(WeightedCorrelation Target, PairColumn First, PairColumn Second, bool Ranks)>();
        for (var p = 0; p < Pairs.Count; p++)
            if (laned[p])
            {
                lanes.Add((Pairs[p].PearsonMoments, Pairs[p].First, Pairs[p].Second, false));
                lanes.Add((Pairs[p].SpearmanMoments, Pairs[p].First, Pairs[p].Second, true));
            }
        var width = PairMomentLanes.Width;
        Parallel.For(0, (lanes.Count + width - 1) / width, options, group => AddLanes(view, lanes, group * width));
    }

    // One group of up to four pairs' co-moments from lanes[k], into their targets.
    private static void AddLanes(Samples.FeatureView view, List<(WeightedCorrelation Target, PairColumn First, PairColumn Second, bool Ranks)> lanes, int k)
    {
        ReadOnlySpan<double> Of(PairColumn column, bool ranks) => ranks ? column.Ranks : view.Feature(column.Feature);
        var width = PairMomentLanes.Width;
        var n = Math.Min(width, lanes.Count - k);
        // Lanes past the last pair repeat the group's first (not read).
        var l = Enumerable.Range(k, width).Select(j => lanes[j < k + n ? j : k]).ToArray();
        PairMomentLanes.Add(l.Take(n).Select(g => g.Target).ToArray(),
            Of(l[0].First, l[0].Ranks), Of(l[0].Second, l[0].Ranks), Of(l[1].First, l[1].Ranks), Of(l[1].Second, l[1].Ranks),
            Of(l[2].First, l[2].Ranks), Of(l[2].Second, l[2].Ranks), Of(l[3].First, l[3].Ranks), Of(l[3].Second, l[3].Ranks));
    }
}
