using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Accumulates, in one streamed pass, Pearson's r of a declared pair and Spearman's ρ as the Pearson correlation of
/// the values' ranks under the reference's marginal CDFs (equal to the sample's own ranks when its marginals match
/// the reference's). Pairs where either value is NaN are skipped. Each feature's cells and ranks come from its
/// <see cref="PairColumn"/>, shared by the pairs of a <see cref="PairAccumulation"/>.
/// </summary>
internal sealed class PairCorrelation
{
    private readonly PairColumn _first, _second;
    private readonly bool _ownColumns;
    // Each feature's storage cell to the joint grid's (null when the grid is not a coarsening of the feature's axis).
    private readonly int[]? _firstToJoint, _secondToJoint;

    /// <summary>A pair with columns of its own, which <see cref="Add"/> prepares itself.</summary>
    public PairCorrelation(CorrelationSpec spec, int first, int second, MarginalCdf firstCdf, MarginalCdf secondCdf, Histogram2D? joint = null)
        : this(spec, new PairColumn(first, firstCdf), new PairColumn(second, secondCdf), joint) => _ownColumns = true;

    /// <summary>A pair reading columns that its <see cref="PairAccumulation"/> prepares for each batch.</summary>
    public PairCorrelation(CorrelationSpec spec, PairColumn first, PairColumn second, Histogram2D? joint)
    {
        Spec = spec;
        (_first, _second) = (first, second);
        Joint = joint;
        _cells = joint is null ? null : new ExactCells(joint.CellCount);
        if (joint is not null)
        {
            _firstToJoint = PairGrid.CellMap(first.Axis, joint.X);
            _secondToJoint = PairGrid.CellMap(second.Axis, joint.Y);
            (_firstOnJoint, _secondOnJoint) = (OnJoint(first, _firstToJoint), OnJoint(second, _secondToJoint));
        }
    }

    // Where a column's cells on the joint grid's axis come from without a map: its own cells when the grid keeps its
    // axis, its map cells when the grid is its map axis (found once per column, however many pairs it is in).
    private enum JointCells { ThroughMap, Own, Map }

    private readonly JointCells _firstOnJoint, _secondOnJoint;

    private static JointCells OnJoint(PairColumn column, int[]? toJoint)
    {
        if (toJoint is null) return JointCells.ThroughMap;
        if (toJoint.AsSpan().SequenceEqual(Enumerable.Range(0, toJoint.Length).ToArray())) return JointCells.Own;
        if (!toJoint.AsSpan().SequenceEqual(PairGrid.MapCellOf(column.Axis))) return JointCells.ThroughMap;
        column.WantMapCells();
        return JointCells.Map;
    }

    private static ReadOnlySpan<int> CellsOnJoint(PairColumn column, JointCells on) => on == JointCells.Own ? column.Cells : column.MapCells;

    /// <summary>
    /// The pair's 2-D histogram on its <see cref="PairGrid"/> (the features' axes for a χ² test, else the coarse map
    /// grid): a per-batch buffer, added exactly into the cells below. Null only where a caller gathers no cells.
    /// </summary>
    public Histogram2D? Joint { get; }

    private readonly ExactCells? _cells;

    private readonly WeightedCorrelation _pearson = new();
    private readonly WeightedCorrelation _spearman = new();

    public CorrelationSpec Spec { get; }

    // Per-batch buffers of the pairs without NaN: values, their reference-CDF ranks, weights, cells.
    private double[] _x = [], _y = [], _u = [], _v = [], _w = [];
    private int[] _cx = [], _cy = [];

    /// <summary>Adds a batch (a pair with columns of its own).</summary>
    public void Add(Samples.FeatureView view)
    {
        if (!_ownColumns) throw new InvalidOperationException("A shared pair is filled through its PairAccumulation.");
        _first.Prepare(view);
        _second.Prepare(view);
        AddPrepared(view);
    }

    /// <summary>Adds a batch whose columns are prepared.</summary>
    internal void AddPrepared(Samples.FeatureView view) => AddPrepared(view, false);

    /// <summary>
    /// Adds a batch whose columns are prepared; with <paramref name="leaveUnitMoments"/>, a batch of unit weights
    /// without NaN in either column gets its cells only, and true is returned: its coefficients' moments are then the
    /// caller's to add (<see cref="PairBatchMoments"/>, from the columns as they are, into <see cref="PearsonMoments"/>
    /// and <see cref="SpearmanMoments"/>).
    /// </summary>
    internal bool AddPrepared(Samples.FeatureView view, bool leaveUnitMoments)
    {
        ReadOnlySpan<double> x = view.Feature(_first.Feature), y = view.Feature(_second.Feature), u = _first.Ranks, v = _second.Ranks;
        ReadOnlySpan<int> cx = _first.Cells, cy = _second.Cells;
        var ws = view.Weights;
        if (_first.HasNaN || _second.HasNaN)
        {
            // Only the rows where both are numbers.
            if (_x.Length < x.Length)
                (_x, _y, _u, _v, _w, _cx, _cy) = (new double[x.Length], new double[x.Length], new double[x.Length], new double[x.Length], new double[x.Length],
                    new int[x.Length], new int[x.Length]);
            var kept = 0;
            for (var r = 0; r < x.Length; r++)
            {
                if (cx[r] == PairColumn.NanCell || cy[r] == PairColumn.NanCell) continue;
                (_x[kept], _y[kept], _u[kept], _v[kept], _cx[kept], _cy[kept]) = (x[r], y[r], u[r], v[r], cx[r], cy[r]);
                if (!ws.IsEmpty) _w[kept] = ws[r];
                kept++;
            }
            x = _x.AsSpan(0, kept);
            y = _y.AsSpan(0, kept);
            u = _u.AsSpan(0, kept);
            v = _v.AsSpan(0, kept);
            cx = _cx.AsSpan(0, kept);
            cy = _cy.AsSpan(0, kept);
            if (!ws.IsEmpty) ws = _w.AsSpan(0, kept);
        }
        if (Joint is not null)
        {
            // A batch without NaN and of unit weights counts the cells as the columns give them on the grid's axes.
            if (ws.IsEmpty && !_first.HasNaN && !_second.HasNaN && _firstOnJoint != JointCells.ThroughMap && _secondOnJoint != JointCells.ThroughMap)
                Joint.CountCells(CellsOnJoint(_first, _firstOnJoint), CellsOnJoint(_second, _secondOnJoint));
            else if (_firstToJoint is not null && _secondToJoint is not null) Joint.FillCells(cx, cy, _firstToJoint, _secondToJoint, ws);
            else Joint.Fill(x, y, ws);
        }
        if (Joint is not null) Joint.MoveCellsInto(_cells!);
        if (leaveUnitMoments && ws.IsEmpty && !_first.HasNaN && !_second.HasNaN) return true;
        _pearson.AddBatch(x, y, ws);
        _spearman.AddBatch(u, v, ws);
        return false;
    }

    /// <summary>The first column, for the moments a caller adds (<see cref="AddPrepared(Samples.FeatureView, bool)"/>).</summary>
    internal PairColumn First => _first;

    /// <summary>The second column.</summary>
    internal PairColumn Second => _second;

    /// <summary>The values' co-moments (Pearson's r).</summary>
    internal WeightedCorrelation PearsonMoments => _pearson;

    /// <summary>The ranks' co-moments (Spearman's ρ).</summary>
    internal WeightedCorrelation SpearmanMoments => _spearman;

    /// <summary>The pair's state as plain numbers.</summary>
    public PairState State() => new(Spec.Name, _pearson.State(), _spearman.State(), _cells?.State());

    /// <summary>Sets a state in the form <see cref="State"/> gives it (into a fresh accumulation); false when it does not fit.</summary>
    public bool SetState(PairState state)
    {
        if (state.Name != Spec.Name) return false;
        if (!_pearson.Restore(state.Pearson.ToArray()) || !_spearman.Restore(state.Spearman.ToArray())) return false;
        if (_cells is null) return state.Cells is null;
        return state.Cells is { } cells && _cells.AddState(cells);
    }

    /// <summary>The pair, finished.</summary>
    public AccumulatedPair Finish() => new(Spec, Pearson, Spearman, EffectiveCount,
        _pearson.AsymptoticVariance, _spearman.AsymptoticVariance, _cells is null ? null : new CellSums(_cells.SumW(), _cells.SumW2()));

    /// <summary>Adds another accumulation of the same pair (coefficients to rounding, 2-D cells exactly).</summary>
    public void Merge(PairCorrelation other)
    {
        _pearson.Merge(other._pearson);
        _spearman.Merge(other._spearman);
        if (_cells is not null && other._cells is not null) _cells.Add(other._cells);
    }

    public double Pearson => _pearson.Pearson;
    public double Spearman => _spearman.Pearson;
    public double EffectiveCount => _pearson.EffectiveCount;
}
