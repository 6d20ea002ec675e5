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

    /// <summary>Rows from which a batch's columns, pairs and slices are spread over threads.</summary>
    private const int ParallelRows = 8192;

    private readonly PairBatchMoments _moments = new();

    /// <summary>The pairs, in declared order.</summary>
    public IReadOnlyList<PairCorrelation> Pairs { get; }

    /// <summary>
    /// Adds a batch to every pair, on up to <paramref name="parallelism"/> threads: the columns side by side, then the
    /// pairs' cells side by side, then the unit-weight pairs' co-moments slice by slice (<see cref="PairBatchMoments"/>).
    /// Each step writes only its own column's, pair's or slice's state, so the numbers do not depend on the threads.
    /// </summary>
    public void Add(Samples.FeatureView view, int parallelism = 1)
    {
        // A small batch stays on the calling thread (as the stream keeps its visits of small batches on one).
        var options = new ParallelOptions { MaxDegreeOfParallelism = view.Rows < ParallelRows ? 1 : Math.Max(1, parallelism) };
        Parallel.ForEach(_columns, options, column => column.Prepare(view));
        // Pairs of unit weight without NaN leave their values' and ranks' co-moments to the batch's vectorised sums.
        var shared = new bool[Pairs.Count];
        Parallel.For(0, Pairs.Count, options, p => shared[p] = Pairs[p].AddPrepared(view, true));
        var columns = new List<PairBatchMoments.Column>();
        var columnIndex = new Dictionary<(PairColumn, bool), int>();
        int Of(PairColumn column, bool ranks)
        {
            if (columnIndex.TryGetValue((column, ranks), out var k)) return k;
            columns.Add(ranks ? () => column.Ranks : () => view.Feature(column.Feature));
            return columnIndex[(column, ranks)] = columns.Count - 1;
        }
        var pairs = new List<(int X, int Y, WeightedCorrelation Target)>();
        for (var p = 0; p < Pairs.Count; p++)
            if (shared[p])
            {
                var (first, second) = (Pairs[p].First, Pairs[p].Second);
                pairs.Add((Of(first, false), Of(second, false), Pairs[p].PearsonMoments));
                pairs.Add((Of(first, true), Of(second, true), Pairs[p].SpearmanMoments));
            }
        _moments.Add(columns, pairs, view.Rows, options);
    }
}
