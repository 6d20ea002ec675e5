using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.References;

/// <summary>
/// Finds each projection's fine grid from the reference itself, in one pass once the features' means, standard
/// deviations and ranges are known: every projected value goes into a <see cref="QuantileGrid"/> (2^16 regular cells
/// over the range a projection can take on the box of the features' ranges, so memory does not grow with the
/// reference), and <see cref="Edges"/> reads the equal-probability edges with finer steps into the tails as a feature's
/// Wasserstein grid does (<see cref="QuantileGrid.FineEdges"/>). The outermost edges hold the whole reference, so
/// beyond them only a sample has weight, which its tail moments integrate exactly.
/// </summary>
internal sealed class SlicedGridBuilder
{
    /// <summary>Equal-probability cells per projection: the default a sliced block's grids are built with.</summary>
    public const int DefaultCells = 512;

    /// <summary>Halvings of a cell's probability into each tail beyond the equal-probability edges.</summary>
    public const int DefaultTailLevels = 4;

    private readonly SlicedProjection _projection;
    private readonly QuantileGrid[] _grids;
    private readonly double[] _row;
    private readonly double[] _lowest;
    private readonly double[] _highest;

    /// <param name="projection">The directions and the reference's standardisation.</param>
    /// <param name="minimum">Each feature's smallest finite value in the reference.</param>
    /// <param name="maximum">Each feature's largest finite value in the reference.</param>
    public SlicedGridBuilder(SlicedProjection projection, IReadOnlyList<double> minimum, IReadOnlyList<double> maximum)
    {
        if (minimum.Count != projection.Dimensions || maximum.Count != projection.Dimensions)
            throw new ArgumentException("One range per feature is needed.");
        _projection = projection;
        _row = new double[projection.Dimensions];
        _grids = new QuantileGrid[projection.Count];
        _lowest = Enumerable.Repeat(double.PositiveInfinity, projection.Count).ToArray();
        _highest = Enumerable.Repeat(double.NegativeInfinity, projection.Count).ToArray();
        var corner = new double[projection.Dimensions];
        for (var k = 0; k < projection.Count; k++)
        {
            // A linear function over a box is extreme at a corner: the lowest takes each feature's end of the
            // coefficient's opposite sign. Widened a little for rounding.
            for (var j = 0; j < corner.Length; j++) corner[j] = projection.Directions[k * corner.Length + j] >= 0 ? minimum[j] : maximum[j];
            var low = projection.ProjectRow(corner, k);
            for (var j = 0; j < corner.Length; j++) corner[j] = projection.Directions[k * corner.Length + j] >= 0 ? maximum[j] : minimum[j];
            var high = projection.ProjectRow(corner, k);
            var slack = 1e-9 * Math.Max(1, Math.Max(Math.Abs(low), Math.Abs(high)));
            _grids[k] = new QuantileGrid(low - slack, high + slack);
        }
    }

    /// <summary>Rows projected at a time: the projections of a chunk are filled into each grid in one call.</summary>
    private const int ChunkRows = 32_768;

    private double[][]? _columns;
    private double[]? _weights;
    private double[]? _projected;
    private double[]? _rowMajor;
    private const int RowsAtOnce = 256;

    /// <summary>
    /// Adds one batch of the reference's rows: the values of <paramref name="features"/> in the projection's order. Rows
    /// with a non-finite value are left out, as the counter leaves them out. The finite rows are projected a chunk at a
    /// time (<see cref="SlicedProjection.ProjectRows"/>, the counter's kernel) and each projection's values
    /// filled into its grid in one call, which gives the same sums as filling them one by one.
    /// </summary>
    public void Add(FeatureView view, IReadOnlyList<int> features)
    {
        var d = _row.Length;
        if (features.Count != d) throw new ArgumentException($"{features.Count} features for a projection of {d}.", nameof(features));
        _columns ??= Enumerable.Range(0, d).Select(_ => new double[ChunkRows]).ToArray();
        _weights ??= new double[ChunkRows];
        _projected ??= new double[_grids.Length * ChunkRows];
        var weights = view.Weights;
        var kept = 0;
        for (var r = 0; r < view.Rows; r++)
        {
            var ok = true;
            for (var j = 0; j < d && ok; j++) ok = double.IsFinite(view.Feature(features[j])[r]);
            if (!ok) continue;
            for (var j = 0; j < d; j++) _columns[j][kept] = view.Feature(features[j])[r];
            _weights[kept] = weights.IsEmpty ? 1.0 : weights[r];
            if (++kept == ChunkRows)
            {
                Flush(kept, !weights.IsEmpty);
                kept = 0;
            }
        }
        if (kept > 0) Flush(kept, !weights.IsEmpty);
    }

    private void Flush(int rows, bool weighted)
    {
        // Row by row with the directions in vector lanes (the counter's kernel, the same numbers to the bit), a few
        // hundred rows at a time, then each projection's values side by side for its grid: a pass over every row per
        // direction and feature (Project) moved the chunk through memory K·d times.
        var count = _grids.Length;
        _rowMajor ??= new double[RowsAtOnce * count];
        for (var at = 0; at < rows; at += RowsAtOnce)
        {
            var n = Math.Min(RowsAtOnce, rows - at);
            _projection.ProjectRows(_columns!, at, n, _rowMajor, count);
            for (var p = 0; p < count; p++)
            {
                var column = _projected!.AsSpan(p * ChunkRows + at, n);
                for (var r = 0; r < column.Length; r++) column[r] = _rowMajor[r * count + p];
            }
        }
        for (var k = 0; k < _grids.Length; k++)
        {
            var values = _projected.AsSpan(k * ChunkRows, rows);
            _grids[k].Fine.Fill(values, weighted ? _weights.AsSpan(0, rows) : ReadOnlySpan<double>.Empty);
            foreach (var p in values)
            {
                if (p < _lowest[k]) _lowest[k] = p;
                if (p > _highest[k]) _highest[k] = p;
            }
        }
    }

    /// <summary>
    /// Each projection's edges (see <see cref="QuantileGrid.FineEdges"/>), the outermost moved in from the range's
    /// box to the reference's own lowest projected value and just above its highest, so no cell is empty space.
    /// </summary>
    public double[][] Edges(int cells = DefaultCells, int tailLevels = DefaultTailLevels)
    {
        var result = new double[_grids.Length][];
        for (var k = 0; k < result.Length; k++)
        {
            var e = _grids[k].FineEdges(cells, tailLevels);
            if (e.Length > 2 && double.IsFinite(_lowest[k]))
            {
                if (_lowest[k] > e[0] && _lowest[k] < e[1]) e[0] = _lowest[k];
                var upper = QuantileGrid.Span(_lowest[k], _highest[k]).Upper;
                if (upper < e[^1] && upper > e[^2]) e[^1] = upper;
            }
            result[k] = e;
        }
        return result;
    }
}
