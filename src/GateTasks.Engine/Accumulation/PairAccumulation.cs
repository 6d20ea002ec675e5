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

    /// <summary>The pairs, in declared order.</summary>
    public IReadOnlyList<PairCorrelation> Pairs { get; }

    /// <summary>Adds a batch to every pair.</summary>
    public void Add(Samples.FeatureView view)
    {
        foreach (var column in _columns) column.Prepare(view);
        // Pairs of unit weight without NaN leave their values' and ranks' co-moments to the lanes, four at a time.
        var lanes = new List<(WeightedCorrelation Target, PairColumn First, PairColumn Second, bool Ranks)>();
        foreach (var pair in Pairs)
            if (pair.AddPrepared(view, PairMomentLanes.Supported))
            {
                lanes.Add((pair.PearsonMoments, pair.First, pair.Second, false));
                lanes.Add((pair.SpearmanMoments, pair.First, pair.Second, true));
            }
        ReadOnlySpan<double> Of(PairColumn column, bool ranks) => ranks ? column.Ranks : view.Feature(column.Feature);
        var width = PairMomentLanes.Width;
        for (var k = 0; k < lanes.Count; k += width)
        {
            var n = Math.Min(width, lanes.Count - k);
            // Lanes past the last pair repeat the group's first (not read).
            var l = Enumerable.Range(k, width).Select(j => lanes[j < k + n ? j : k]).ToArray();
            PairMomentLanes.Add(l.Take(n).Select(g => g.Target).ToArray(),
                Of(l[0].First, l[0].Ranks), Of(l[0].Second, l[0].Ranks), Of(l[1].First, l[1].Ranks), Of(l[1].Second, l[1].Ranks),
                Of(l[2].First, l[2].Ranks), Of(l[2].Second, l[2].Ranks), Of(l[3].First, l[3].Ranks), Of(l[3].Second, l[3].Ranks));
        }
    }
}
