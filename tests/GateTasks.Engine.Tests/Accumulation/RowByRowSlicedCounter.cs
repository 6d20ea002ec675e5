using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Accumulation;

using GateTasks.Engine.Accumulation;

/// <summary>
/// The sliced fill as it was written first, kept in the tests as the yardstick of the streamed counter: row by row and
/// projection by projection in plain doubles, each row's projection from <see cref="SlicedProjection.ProjectRow"/> and
/// its cell from a plain binary search (Array.BinarySearch) over the edges, every batch's sums added exactly as it
/// ends. <see cref="SlicedHistogramCounter"/> must give the same state to the bit.
/// </summary>
internal sealed class RowByRowSlicedCounter
{
    /// <summary>
    /// Groups of rows kept apart for the uncertainty, resampled whole with Rao &amp; Wu's (1988) rescaling: 16 groups
    /// give a standard error to about ±18% (15 degrees of freedom) at 16 × K × (cells + 3) sums per side.
    /// </summary>
    public const int DefaultGroups = 16;

    private const int ChunkRows = 256;

    private readonly SlicedProjection _projection;
    private readonly SlicedCellLookup[] _lookups;
    private readonly int[] _offsets; // start of projection k's packed block: [below moment, cells…, above moment]
    private readonly int _stride;    // Σ_k packed length
    // The groups' sums are laid out projection by projection, the G groups of a projection side by side, so filling
    // one projection touches G·(cells + 3) doubles (about 70 kB for 512 cells), which stay in cache.
    private readonly int _groups;

    // Per batch, plain sums; then exactly.
    private readonly double[] _batchGroups;   // [G·offset_k + g·length_k + i]
    private readonly double[] _batchSquares;  // [offset_k + i]: Σw² per cell, Σw²·d² per tail
    private readonly double[] _batchMoments;  // [3k + m]: Σw, Σw·p, Σw·p²
    private readonly ExactSumArray _groupSums;
    private readonly ExactSumArray _squareSums;
    private readonly ExactSumArray _momentSums;
    private long _rows;
    private long _skipped;

    // Chunk buffers.
    private readonly double[][] _columns;
    private readonly double[] _weights = new double[ChunkRows];
    private readonly double[] _projected;
    private readonly int[] _group = new int[ChunkRows];
    private readonly bool[] _valid = new bool[ChunkRows];

    /// <param name="projection">The directions and the reference's standardisation.</param>
    /// <param name="edges">Per projection, its strictly increasing edges (at least two).</param>
    /// <param name="groups">Groups of rows kept apart (at least 2).</param>
    public RowByRowSlicedCounter(SlicedProjection projection, IReadOnlyList<double[]> edges, int groups = DefaultGroups)
    {
        if (edges.Count != projection.Count)
            throw new ArgumentException($"{edges.Count} grids for {projection.Count} projections.", nameof(edges));
        ArgumentOutOfRangeException.ThrowIfLessThan(groups, 2);
        _projection = projection;
        _groups = groups;
        _lookups = edges.Select(e => new SlicedCellLookup((double[])e.Clone())).ToArray();
        _offsets = new int[_lookups.Length];
        var offset = 0;
        for (var k = 0; k < _lookups.Length; k++)
        {
            _offsets[k] = offset;
            offset += _lookups[k].Cells + 2;
        }
        _stride = offset;
        _batchGroups = new double[groups * _stride];
        _batchSquares = new double[_stride];
        _batchMoments = new double[3 * projection.Count];
        _groupSums = new ExactSumArray(_batchGroups.Length);
        _squareSums = new ExactSumArray(_stride);
        _momentSums = new ExactSumArray(_batchMoments.Length);
        _columns = Enumerable.Range(0, projection.Dimensions).Select(_ => new double[ChunkRows]).ToArray();
        _projected = new double[projection.Count * ChunkRows];
    }

    /// <summary>The number of groups.</summary>
    public int Groups => _groups;

    /// <summary>Adds one batch of a sample's rows: the values of <paramref name="features"/> (in the projection's order) and the weights.</summary>
    public void Add(FeatureView view, IReadOnlyList<int> features)
    {
        if (features.Count != _projection.Dimensions)
            throw new ArgumentException($"{features.Count} features for a projection of {_projection.Dimensions}.", nameof(features));
        var weights = view.Weights;
        for (var start = 0; start < view.Rows; start += ChunkRows)
        {
            var n = Math.Min(ChunkRows, view.Rows - start);
            for (var j = 0; j < features.Count; j++) view.Feature(features[j]).Slice(start, n).CopyTo(_columns[j]);
            if (!weights.IsEmpty) weights.Slice(start, n).CopyTo(_weights);
            Chunk(n, !weights.IsEmpty);
        }
        Absorb();
    }

    private void Chunk(int n, bool weighted)
    {
        var d = _projection.Dimensions;
        var k = _projection.Count;
        for (var r = 0; r < n; r++)
        {
            var h = 0x9E3779B97F4A7C15UL;
            var ok = true;
            for (var j = 0; j < d; j++)
            {
                var x = _columns[j][r];
                ok &= double.IsFinite(x);
                h = (h ^ (ulong)BitConverter.DoubleToInt64Bits(x == 0 ? 0.0 : x)) * 0xBF58476D1CE4E5B9UL;
                h ^= h >> 29;
            }
            _valid[r] = ok;
            // Final mix (SplitMix64's finaliser, Steele, Lea & Flood 2014), then the top bits scaled to [0, G).
            h = (h ^ (h >> 30)) * 0xBF58476D1CE4E5B9UL;
            h = (h ^ (h >> 27)) * 0x94D049BB133111EBUL;
            h ^= h >> 31;
            _group[r] = (int)(((h >> 32) * (ulong)_groups) >> 32);
            if (!ok) for (var j = 0; j < d; j++) _columns[j][r] = 0; // keep the projection finite; the row is skipped
        }
        var values = new double[d];
        for (var r = 0; r < n; r++)
        {
            for (var j = 0; j < d; j++) values[j] = _columns[j][r];
            for (var p = 0; p < k; p++) _projected[p * ChunkRows + r] = _projection.ProjectRow(values, p);
        }
        for (var p = 0; p < k; p++)
        {
            var row = _projected.AsSpan(p * ChunkRows, n);
            for (var r = 0; r < n; r++)
                if (!double.IsFinite(row[r])) _valid[r] = false;
        }
        for (var r = 0; r < n; r++)
        {
            if (_valid[r]) _rows++;
            else _skipped++;
        }
        for (var p = 0; p < k; p++) Fill(p, n, weighted);
    }

    private void Fill(int p, int n, bool weighted)
    {
        var lookup = _lookups[p];
        var edges = lookup.Edges;
        double low = edges[0], high = edges[^1];
        var top = edges.Length; // the overflow cell
        var offset = _offsets[p];
        var length = lookup.Cells + 2;
        var last = offset + length - 1; // the above-moment entry
        var groupBase = _groups * offset;
        var values = _projected.AsSpan(p * ChunkRows, n);
        double s0 = 0, s1 = 0, s2 = 0;
        for (var r = 0; r < n; r++)
        {
            if (!_valid[r]) continue;
            var x = values[r];
            var w = weighted ? _weights[r] : 1.0;
            var i = Array.BinarySearch(edges, x);
            var c = i >= 0 ? i + 1 : ~i; // an exact hit at edge i is cell i + 1
            var g = groupBase + _group[r] * length;
            var w2 = w * w;
            _batchGroups[g + 1 + c] += w;
            _batchSquares[offset + 1 + c] += w2;
            if (c == 0)
            {
                var dist = low - x;
                _batchGroups[g] += w * dist;
                _batchSquares[offset] += w2 * dist * dist;
            }
            else if (c == top)
            {
                var dist = x - high;
                _batchGroups[g + length - 1] += w * dist;
                _batchSquares[last] += w2 * dist * dist;
            }
            s0 += w;
            s1 += w * x;
            s2 += w * x * x;
        }
        _batchMoments[3 * p] += s0;
        _batchMoments[3 * p + 1] += s1;
        _batchMoments[3 * p + 2] += s2;
    }

    private void Absorb()
    {
        _groupSums.AddRange(_batchGroups);
        _squareSums.AddRange(_batchSquares);
        _momentSums.AddRange(_batchMoments);
        Array.Clear(_batchGroups);
        Array.Clear(_batchSquares);
        Array.Clear(_batchMoments);
    }

    /// <summary>Adds another counter's sums (same projection, grids and groups; exact).</summary>
    public void Merge(RowByRowSlicedCounter other)
    {
        if (other._stride != _stride || other._groups != _groups)
            throw new ArgumentException("The other counter's grids or groups differ.", nameof(other));
        _groupSums.Add(other._groupSums);
        _squareSums.Add(other._squareSums);
        _momentSums.Add(other._momentSums);
        _rows += other._rows;
        _skipped += other._skipped;
    }

    /// <summary>The whole state as plain numbers.</summary>
    public SlicedHistogramState State() =>
        new(_groups, _groupSums.State(), _squareSums.State(), _momentSums.State(), _rows, _skipped);

    /// <summary>Adds a state in the form <see cref="State"/> gives it; false when it does not fit these grids and groups.</summary>
    public bool AddState(SlicedHistogramState state)
    {
        if (state.Groups != _groups || state.Rows < 0 || state.Skipped < 0
            || state.GroupCells.High.Count != _groupSums.Length || state.CellSquares.High.Count != _squareSums.Length
            || state.Moments.High.Count != _momentSums.Length)
            return false;
        if (!_groupSums.AddState(state.GroupCells) || !_squareSums.AddState(state.CellSquares) || !_momentSums.AddState(state.Moments))
            return false;
        _rows += state.Rows;
        _skipped += state.Skipped;
        return true;
    }

    /// <summary>The histograms, each exact sum rounded once (a cell's total from the exact sum over its groups).</summary>
    public SlicedHistograms Finish()
    {
        var k = _lookups.Length;
        var cells = new double[k][];
        var squares = new double[k][];
        var groups = new double[k][][];
        var mean = new double[k];
        var sd = new double[k];
        for (var p = 0; p < k; p++)
        {
            var length = _lookups[p].Cells + 2;
            var offset = _offsets[p];
            cells[p] = new double[length];
            squares[p] = new double[length];
            groups[p] = new double[_groups][];
            for (var g = 0; g < _groups; g++)
            {
                groups[p][g] = new double[length];
                for (var i = 0; i < length; i++) groups[p][g][i] = _groupSums.Value(_groups * offset + g * length + i);
            }
            for (var i = 0; i < length; i++)
            {
                var total = new ExactSum();
                for (var g = 0; g < _groups; g++)
                    foreach (var t in _groupSums.Terms(_groups * offset + g * length + i)) total.Add(t);
                cells[p][i] = total.Value;
                squares[p][i] = _squareSums.Value(offset + i);
            }
            var s0 = _momentSums.Value(3 * p);
            mean[p] = s0 != 0 ? _momentSums.Value(3 * p + 1) / s0 : double.NaN;
            sd[p] = s0 > 0 ? Math.Sqrt(Math.Max(0, _momentSums.Value(3 * p + 2) / s0 - mean[p] * mean[p])) : double.NaN;
        }
        return new SlicedHistograms(_projection.Directions, _lookups.Select(l => (double[])l.Edges.Clone()).ToArray(),
            cells, squares, groups, mean, sd, _rows, _skipped);
    }
}
