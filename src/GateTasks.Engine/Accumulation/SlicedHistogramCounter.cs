using System.Numerics;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Streams rows of a feature set into the histograms of K fixed projections (<see cref="SlicedProjection"/>), each on
/// its own fine grid of edges fixed in advance from the reference (an equal-probability grid of the reference's
/// projected values, as a feature's Wasserstein grid is: <see cref="FineGridCounter"/>). Per projection it keeps, like
/// that grid, Σw per cell (flows included), the tails' first moments Σw·(e₀ − x) and Σw·(x − e_last) beyond the
/// outermost edges, Σw² of each, and Σw, Σw·p, Σw·p² for the projection's own mean and spread.
/// <para>
/// The Σw and tail moments are kept apart for <see cref="Groups"/> groups of rows, a row's group fixed by a hash of
/// its feature values (so it depends neither on the order of the rows nor on how they are split into shards, and
/// copies of one event — an event split into signed weights — stay together). The groups let the uncertainty of a
/// sliced distance be estimated by resampling whole groups (Checks/SlicedBootstrap), which carries the correlation
/// between projections of the same events; their sum is the sample's histogram.
/// </para>
/// <para>
/// A row with a non-finite value in any feature, or a non-finite projection, is left out of every projection and
/// counted (<see cref="SlicedHistograms.Skipped"/>). Weights may be negative. Sums are formed per batch in plain
/// doubles and added exactly (<see cref="ExactSumArray"/>), so shards merge to the bits of one pass; with unit weights
/// a cell's Σw and Σw² are integer counts, kept in ints and added exactly when the state is read, merged or finished
/// (or per batch once weights or another counter's sums have been added), which gives the same exact sums and terms.
/// Memory is G·K·(cells + 3) exact sums of 16 bytes, a batch buffer of 8 bytes each, (G + 1)·K·(cells + 3) counts of
/// 4 bytes and K·2048 projected values (about 16 MB for G = 16, K = 64 and 512 cells), whatever the number of rows.
/// Hand it large batches: each weighted batch's exact addition visits every cell once.
/// </para>
/// <para>
/// How a batch is worked (every number as a row-by-row fill in plain doubles gives it, to the bit; tests compare the
/// two): per chunk of 256 rows the rows' groups are hashed in vector lanes, the rows projected a row at a time with the
/// K directions in vector lanes (<see cref="SlicedProjection.ProjectRows"/>), the moments summed per projection in
/// vector lanes in row order, and the projections copied into columns; per block of 2048 rows each projection's cells
/// are found in one tight loop (<see cref="SlicedCellLookup.CellsOf"/>) and added, so one projection's cells stay in
/// the first-level cache while its rows are added (a row touching all K projections' cells missed it on most).
/// </para>
/// </summary>
internal sealed class SlicedHistogramCounter
{
    /// <summary>
    /// Groups of rows kept apart for the uncertainty, resampled whole with Rao &amp; Wu's (1988) rescaling: 16 groups
    /// give a standard error to about ±18% (15 degrees of freedom) at 16 × K × (cells + 3) sums per side.
    /// </summary>
    public const int DefaultGroups = 16;

    // Moments are summed per chunk of 256 rows from the batch's start (their rounding depends on it); cells are added a
    // block of chunks at a time.
    private const int ChunkRows = 256;
    private const int BlockRows = 2048;

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
    // Unit weights: per group and cell the rows counted since the last flush (same layout as _batchGroups; the tail
    // entries unused), added to the exact sums only when read or merged, or as each batch ends once they may no longer
    // be (after weights or another counter's sums were added).
    private int[]? _counts;
    private long _pendingRows;
    private bool _deferCounts = true;
    private readonly int[] _lengths;    // per projection: cells + 2
    private readonly int[] _groupBases; // per projection: G·offset
    private readonly int[] _countBases; // per projection: (G + 1)·offset, the counts' layout with a spare group
    private readonly int[] _countGroup = new int[BlockRows];

    // Chunk buffers.
    private readonly double[][] _columns;
    private readonly double[] _weights = new double[BlockRows];
    private readonly double[] _projected;
    private readonly int _rowStride; // K rounded up to an odd number of cache lines, so a column's values spread over the cache's sets
    private readonly double[] _byProjection; // [k·BlockRows + r]
    private readonly int[] _cells = new int[BlockRows];
    private readonly int[] _group = new int[BlockRows];
    private readonly bool[] _valid = new bool[BlockRows];

    /// <param name="projection">The directions and the reference's standardisation.</param>
    /// <param name="edges">Per projection, its strictly increasing edges (at least two).</param>
    /// <param name="groups">Groups of rows kept apart (at least 2).</param>
    public SlicedHistogramCounter(SlicedProjection projection, IReadOnlyList<double[]> edges, int groups = DefaultGroups)
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
        _lengths = _lookups.Select(l => l.Cells + 2).ToArray();
        _groupBases = _offsets.Select(o => groups * o).ToArray();
        _countBases = _offsets.Select(o => (groups + 1) * o).ToArray();
        _batchGroups = new double[groups * _stride];
        _batchSquares = new double[_stride];
        _batchMoments = new double[3 * projection.Count];
        _groupSums = new ExactSumArray(_batchGroups.Length);
        _squareSums = new ExactSumArray(_stride);
        _momentSums = new ExactSumArray(_batchMoments.Length);
        _columns = Enumerable.Range(0, projection.Dimensions).Select(_ => new double[ChunkRows]).ToArray();
        _rowStride = ((projection.Count + 7) / 8 | 1) * 8;
        _projected = new double[_rowStride * ChunkRows]; // [r·stride + k]
        _byProjection = new double[projection.Count * BlockRows];
    }

    /// <summary>The number of groups.</summary>
    public int Groups => _groups;

    /// <summary>Adds one batch of a sample's rows: the values of <paramref name="features"/> (in the projection's order) and the weights.</summary>
    public void Add(FeatureView view, IReadOnlyList<int> features)
    {
        if (features.Count != _projection.Dimensions)
            throw new ArgumentException($"{features.Count} features for a projection of {_projection.Dimensions}.", nameof(features));
        var weights = view.Weights;
        var weighted = !weights.IsEmpty;
        if (weighted)
        {
            // From here on every batch is added as it ends: its weights' sums are not integers, so the exact sums'
            // terms would depend on how the counts were grouped before them.
            FlushCounts();
            _deferCounts = false;
        }
        else
        {
            _counts ??= new int[(_groups + 1) * _stride];
            // Counts stay exact in int up to int.MaxValue rows and in one double up to 2^53 (an exact sum of integers
            // below that is its one leading term, however they are grouped).
            if (_pendingRows + view.Rows > int.MaxValue) FlushCounts();
            if (_rows + _skipped + view.Rows >= 1L << 52) _deferCounts = false;
            _pendingRows += view.Rows;
        }
        for (var block = 0; block < view.Rows; block += BlockRows)
        {
            var m = Math.Min(BlockRows, view.Rows - block);
            for (var at = 0; at < m; at += ChunkRows)
            {
                var n = Math.Min(ChunkRows, m - at);
                for (var j = 0; j < features.Count; j++) view.Feature(features[j]).Slice(block + at, n).CopyTo(_columns[j]);
                if (weighted) weights.Slice(block + at, n).CopyTo(_weights.AsSpan(at));
                Chunk(at, n, weighted);
            }
            if (weighted) AddWeights(m);
            else AddCounts(m);
        }
        Absorb(weighted);
    }

    /// <summary>Rows [at, at + n) of the block: groups, projections, moments and cells (and any tail moments).</summary>
    private void Chunk(int at, int n, bool weighted)
    {
        var k = _projection.Count;
        Hash(at, n);
        for (var r = 0; r < n; r++)
            if (!_valid[at + r])
                foreach (var column in _columns) column[r] = 0; // keep the projection finite; the row is skipped
        _projection.ProjectRows(_columns, 0, n, _projected, _rowStride);
        for (var r = 0; r < n; r++)
        {
            if (_valid[at + r] && !AllFinite(_projected.AsSpan(r * _rowStride, k))) _valid[at + r] = false;
            if (_valid[at + r]) _rows++;
            else _skipped++;
        }
        Moments(at, n, weighted);
        Transpose(at, n);
    }

    /// <summary>
    /// Each row's group and whether its values are all finite. The hash is a chain over the row's values (0 for ±0), each
    /// step x ↦ (h ⊕ bits)·c, h ⊕= h ≫ 29, then SplitMix64's finaliser (Steele, Lea &amp; Flood 2014), and the top bits
    /// scaled to [0, G); rows are hashed side by side in vector lanes, with the same integer arithmetic in every lane.
    /// </summary>
    private void Hash(int at, int n)
    {
        var d = _columns.Length;
        var r = 0;
        if (Vector.IsHardwareAccelerated)
        {
            var lanes = Vector<ulong>.Count;
            var exponent = new Vector<ulong>(0x7FF0000000000000UL);
            for (; r + lanes <= n; r += lanes)
            {
                var h = new Vector<ulong>(HashStart);
                var bad = Vector<ulong>.Zero;
                for (var j = 0; j < d; j++)
                {
                    var x = new Vector<double>(_columns[j], r);
                    var bits = Vector.AndNot(Vector.AsVectorUInt64(x), Vector.AsVectorUInt64(Vector.Equals(x, Vector<double>.Zero)));
                    bad |= Vector.Equals(bits & exponent, exponent);
                    h = (h ^ bits) * new Vector<ulong>(HashStep);
                    h ^= Vector.ShiftRightLogical(h, 29);
                }
                h = (h ^ Vector.ShiftRightLogical(h, 30)) * new Vector<ulong>(HashStep);
                h = (h ^ Vector.ShiftRightLogical(h, 27)) * new Vector<ulong>(HashFinal);
                h ^= Vector.ShiftRightLogical(h, 31);
                var g = Vector.ShiftRightLogical(Vector.ShiftRightLogical(h, 32) * new Vector<ulong>((ulong)_groups), 32);
                for (var i = 0; i < lanes; i++)
                {
                    _group[at + r + i] = (int)g[i];
                    _valid[at + r + i] = bad[i] == 0;
                }
            }
        }
        for (; r < n; r++)
        {
            var h = HashStart;
            var ok = true;
            for (var j = 0; j < d; j++)
            {
                var x = _columns[j][r];
                ok &= double.IsFinite(x);
                h = (h ^ (ulong)BitConverter.DoubleToInt64Bits(x == 0 ? 0.0 : x)) * HashStep;
                h ^= h >> 29;
            }
            _valid[at + r] = ok;
            h = (h ^ (h >> 30)) * HashStep;
            h = (h ^ (h >> 27)) * HashFinal;
            h ^= h >> 31;
            _group[at + r] = (int)(((h >> 32) * (ulong)_groups) >> 32);
        }
    }

    private const ulong HashStart = 0x9E3779B97F4A7C15UL;
    private const ulong HashStep = 0xBF58476D1CE4E5B9UL;
    private const ulong HashFinal = 0x94D049BB133111EBUL;

    private static bool AllFinite(ReadOnlySpan<double> values)
    {
        // x − x is 0 for a finite x and NaN otherwise.
        var i = 0;
        if (Vector.IsHardwareAccelerated && values.Length >= Vector<double>.Count)
        {
            var all = Vector<long>.AllBitsSet;
            var vectors = System.Runtime.InteropServices.MemoryMarshal.Cast<double, Vector<double>>(values);
            foreach (var v in vectors) all &= Vector.Equals(v - v, Vector<double>.Zero);
            if (!all.Equals(Vector<long>.AllBitsSet)) return false;
            i = vectors.Length * Vector<double>.Count;
        }
        for (; i < values.Length; i++)
            if (!double.IsFinite(values[i])) return false;
        return true;
    }

    /// <summary>
    /// Per projection the chunk's Σw, Σw·p and Σw·p² in row order from zero, each then added to the batch's: the
    /// projections side by side in vector lanes (a row's projections are adjacent), each lane the same chain of
    /// roundings as one projection's scalar loop.
    /// </summary>
    private void Moments(int at, int n, bool weighted)
    {
        var count = _projection.Count;
        var k = 0;
        if (Vector.IsHardwareAccelerated)
        {
            var lanes = Vector<double>.Count;
            // Two vectors of projections at a time, so two chains of additions overlap.
            for (; k + 2 * lanes <= count; k += 2 * lanes)
            {
                Vector<double> s0 = default, s1 = default, s2 = default, t0 = default, t1 = default, t2 = default;
                for (var r = 0; r < n; r++)
                {
                    if (!_valid[at + r]) continue;
                    var x = new Vector<double>(_projected, r * _rowStride + k);
                    var y = new Vector<double>(_projected, r * _rowStride + k + lanes);
                    if (weighted)
                    {
                        var w = new Vector<double>(_weights[at + r]);
                        var wx = w * x;
                        var wy = w * y;
                        s0 += w;
                        s1 += wx;
                        s2 += wx * x;
                        t0 += w;
                        t1 += wy;
                        t2 += wy * y;
                    }
                    else
                    {
                        s0 += Vector<double>.One;
                        s1 += x;
                        s2 += x * x;
                        t0 += Vector<double>.One;
                        t1 += y;
                        t2 += y * y;
                    }
                }
                AddMoments(k, s0, s1, s2);
                AddMoments(k + lanes, t0, t1, t2);
            }
            for (; k + lanes <= count; k += lanes)
            {
                Vector<double> s0 = default, s1 = default, s2 = default;
                for (var r = 0; r < n; r++)
                {
                    if (!_valid[at + r]) continue;
                    var x = new Vector<double>(_projected, r * _rowStride + k);
                    if (weighted)
                    {
                        var w = new Vector<double>(_weights[at + r]);
                        var wx = w * x;
                        s0 += w;
                        s1 += wx;
                        s2 += wx * x;
                    }
                    else
                    {
                        s0 += Vector<double>.One;
                        s1 += x;
                        s2 += x * x;
                    }
                }
                AddMoments(k, s0, s1, s2);
            }
        }
        for (; k < count; k++)
        {
            double s0 = 0, s1 = 0, s2 = 0;
            for (var r = 0; r < n; r++)
            {
                if (!_valid[at + r]) continue;
                var x = _projected[r * _rowStride + k];
                var w = weighted ? _weights[at + r] : 1.0;
                s0 += w;
                s1 += w * x;
                s2 += w * x * x;
            }
            _batchMoments[3 * k] += s0;
            _batchMoments[3 * k + 1] += s1;
            _batchMoments[3 * k + 2] += s2;
        }
    }

    private void AddMoments(int k, Vector<double> s0, Vector<double> s1, Vector<double> s2)
    {
        for (var i = 0; i < Vector<double>.Count; i++)
        {
            _batchMoments[3 * (k + i)] += s0[i];
            _batchMoments[3 * (k + i) + 1] += s1[i];
            _batchMoments[3 * (k + i) + 2] += s2[i];
        }
    }

    /// <summary>The chunk's projections into the block's columns, one projection's values side by side.</summary>
    private void Transpose(int at, int n)
    {
        for (var p = 0; p < _projection.Count; p++)
        {
            var column = _byProjection.AsSpan(p * BlockRows + at, n);
            for (var r = 0; r < column.Length; r++) column[r] = _projected[r * _rowStride + p];
        }
    }

    /// <summary>
    /// Unit weights: each valid row adds one to its group's cell, an integer count, and in a flow its tail moments.
    /// Projection by projection over the block, so one projection's G·(cells + 2) counts (about 33 kB) and its lookup
    /// table and edges stay in the first-level cache while its rows are added; all projections' counts (about 2 MB) do
    /// not, and a row at a time missed the cache on most of its K cells.
    /// </summary>
    private void AddCounts(int m)
    {
        var counts = _counts!;
        var cells = _cells.AsSpan(0, m);
        for (var r = 0; r < m; r++) _countGroup[r] = _valid[r] ? _group[r] : _groups; // a skipped row counts in a spare group
        for (var p = 0; p < _lengths.Length; p++)
        {
            var length = _lengths[p];
            var top = (uint)(length - 4); // c − 1 for c = edges.Length, the overflow
            var block = _groupBases[p];
            var countBlock = _countBases[p] + 1;
            var values = _byProjection.AsSpan(p * BlockRows, m);
            _lookups[p].CellsOf(values, cells);
            for (var r = 0; r < cells.Length; r++)
            {
                var c = cells[r];
                counts[countBlock + _countGroup[r] * length + c]++;
                if ((uint)(c - 1) >= top && _valid[r]) Tail(p, block + _group[r] * length, c, values[r], 1.0);
            }
        }
    }

    /// <summary>Weights: each row adds w to its group's cell and w² to the cell's Σw², in row order as a row-by-row fill does.</summary>
    private void AddWeights(int m)
    {
        var cells = _cells.AsSpan(0, m);
        for (var p = 0; p < _lengths.Length; p++)
        {
            var length = _lengths[p];
            var top = length - 3;
            var block = _groupBases[p];
            var squares = _offsets[p] + 1;
            var values = _byProjection.AsSpan(p * BlockRows, m);
            _lookups[p].CellsOf(values, cells);
            for (var r = 0; r < cells.Length; r++)
            {
                if (!_valid[r]) continue;
                var c = cells[r];
                var g = block + _group[r] * length;
                var w = _weights[r];
                _batchGroups[g + 1 + c] += w;
                _batchSquares[squares + c] += w * w;
                if (c == 0 || c == top) Tail(p, g, c, values[r], w);
            }
        }
    }

    /// <summary>A value in a flow: its distance beyond the outermost edge into the group's tail moment and the tail's Σw²·d².</summary>
    private void Tail(int p, int g, int c, double x, double w)
    {
        var edges = _lookups[p].Edges;
        var length = _lengths[p];
        var w2 = w * w;
        if (c == 0)
        {
            var dist = edges[0] - x;
            _batchGroups[g] += w * dist;
            _batchSquares[_offsets[p]] += w2 * dist * dist;
        }
        else
        {
            var dist = x - edges[^1];
            _batchGroups[g + length - 1] += w * dist;
            _batchSquares[_offsets[p] + length - 1] += w2 * dist * dist;
        }
    }

    private void Absorb(bool weighted)
    {
        if (weighted)
        {
            _groupSums.AddRange(_batchGroups);
            _squareSums.AddRange(_batchSquares);
            Array.Clear(_batchGroups);
            Array.Clear(_batchSquares);
        }
        else
        {
            // Only the tail moments were summed in doubles; the cells are counts.
            for (var p = 0; p < _lengths.Length; p++)
            {
                var length = _lengths[p];
                for (var g = 0; g < _groups; g++)
                {
                    var at = _groupBases[p] + g * length;
                    AbsorbEntry(_groupSums, _batchGroups, at);
                    AbsorbEntry(_groupSums, _batchGroups, at + length - 1);
                }
                AbsorbEntry(_squareSums, _batchSquares, _offsets[p]);
                AbsorbEntry(_squareSums, _batchSquares, _offsets[p] + length - 1);
            }
            if (!_deferCounts) FlushCounts();
        }
        _momentSums.AddRange(_batchMoments);
        Array.Clear(_batchMoments);
    }

    private static void AbsorbEntry(ExactSumArray sums, double[] batch, int at)
    {
        if (batch[at] == 0) return;
        sums.Add(at, batch[at]);
        batch[at] = 0;
    }

    /// <summary>
    /// Adds the counts kept since the last flush: each group's cell count, and its sum over the groups as the cell's
    /// Σw² (w² = 1), both exact integers.
    /// </summary>
    private void FlushCounts()
    {
        _pendingRows = 0;
        if (_counts is not { } counts) return;
        for (var p = 0; p < _lengths.Length; p++)
        {
            var length = _lengths[p];
            for (var i = 1; i < length - 1; i++)
            {
                long total = 0;
                for (var g = 0; g < _groups; g++)
                {
                    var at = _countBases[p] + g * length + i;
                    if (counts[at] == 0) continue;
                    _groupSums.Add(_groupBases[p] + g * length + i, counts[at]);
                    total += counts[at];
                    counts[at] = 0;
                }
                if (total != 0) _squareSums.Add(_offsets[p] + i, total);
            }
        }
        Array.Clear(counts); // and the spare group's counts of skipped rows
    }

    /// <summary>Adds another counter's sums (same projection, grids and groups; exact).</summary>
    public void Merge(SlicedHistogramCounter other)
    {
        if (other._stride != _stride || other._groups != _groups)
            throw new ArgumentException("The other counter's grids or groups differ.", nameof(other));
        FlushCounts();
        other.FlushCounts();
        _deferCounts = false;
        _groupSums.Add(other._groupSums);
        _squareSums.Add(other._squareSums);
        _momentSums.Add(other._momentSums);
        _rows += other._rows;
        _skipped += other._skipped;
    }

    /// <summary>The whole state as plain numbers.</summary>
    public SlicedHistogramState State()
    {
        FlushCounts();
        return new(_groups, _groupSums.State(), _squareSums.State(), _momentSums.State(), _rows, _skipped);
    }

    /// <summary>Adds a state in the form <see cref="State"/> gives it; false when it does not fit these grids and groups.</summary>
    public bool AddState(SlicedHistogramState state)
    {
        if (state.Groups != _groups || state.Rows < 0 || state.Skipped < 0
            || state.GroupCells.High.Count != _groupSums.Length || state.CellSquares.High.Count != _squareSums.Length
            || state.Moments.High.Count != _momentSums.Length)
            return false;
        FlushCounts();
        _deferCounts = false;
        if (!_groupSums.AddState(state.GroupCells) || !_squareSums.AddState(state.CellSquares) || !_momentSums.AddState(state.Moments))
            return false;
        _rows += state.Rows;
        _skipped += state.Skipped;
        return true;
    }

    /// <summary>The histograms, each exact sum rounded once (a cell's total from the exact sum over its groups).</summary>
    public SlicedHistograms Finish()
    {
        FlushCounts();
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
