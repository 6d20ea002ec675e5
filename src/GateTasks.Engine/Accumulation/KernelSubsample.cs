using System.Runtime.CompilerServices;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// The sample rows the kernel distance is computed on: a bottom-K sketch (Cohen &amp; Kaplan 2007, "Summarizing data
/// using bottom-k sketches", PODC) over the joint feature values. Each row gets a 64-bit hash of its values
/// (<see cref="JointRowHash"/>); rows of equal values are one entry (their count, and the exact sums of their weights
/// and squared weights, Shewchuk 1997), and the K entries of smallest selection key (the hash's top 60 bits) are kept,
/// with every entry whose key ties the K-th. So the rows of one event split into signed weights, which share their
/// values, are kept or dropped together, and a joint block whose features take at most K distinct value rows keeps
/// every row. Which rows are kept depends only on the values, never on the order, file, shard or batch they come in:
/// one pass and a merge of shards keep the same entries with the same exact sums, and <see cref="Sums"/> adds them
/// in one canonical order (by hash, then the values' bits), so the kernel's numbers agree to the bit.
/// <para>
/// Streaming: a row whose key is above the current threshold (the K-th smallest key held) is rejected by one
/// comparison after its hash; only the few below it are copied. When the store is full (2K entries) equal rows are
/// joined, it is cut back in place to its K smallest entries and the threshold drops; about K·(1 + ln(n/K)) rows are
/// ever copied for n distinct rows. Memory is at most 2K entries of d + 3 numbers (and the exact sums of the entries
/// that join several rows), whatever n; more only when entries of different values share the K-th key (a 60-bit
/// collision).
/// </para>
/// </summary>
internal sealed class KernelSubsample
{
    private const int ChunkRows = 256;
    private const int InitialCapacity = 1024;

    private readonly int _width;
    private readonly int _limit;
    private ulong[] _hashes = new ulong[InitialCapacity];
    private double[] _values;
    private long[] _counts = new long[InitialCapacity];
    // A single row's weight, or (for an entry of several rows) null here and its exact sums in _joined.
    private double[] _weights = new double[InitialCapacity];
    private (ExactSum Weights, ExactSum Squares)?[] _joined = new (ExactSum, ExactSum)?[InitialCapacity];
    private int _entries;
    // Keys above this are never kept: at least K entries are held at or below it.
    private ulong _threshold = ulong.MaxValue;
    private readonly ulong[] _chunkHashes = new ulong[ChunkRows];

    /// <summary>An empty subsample of rows of <paramref name="width"/> features keeping at most <paramref name="limit"/> entries (plus ties).</summary>
    public KernelSubsample(int width, int limit)
    {
        if (width < 1) throw new ArgumentOutOfRangeException(nameof(width), width, "Rows need at least one feature.");
        if (limit < 1) throw new ArgumentOutOfRangeException(nameof(limit), limit, "At least one row is kept.");
        _width = width;
        _limit = limit;
        _values = new double[InitialCapacity * width];
    }

    /// <summary>K: the distinct value rows kept (ties at the K-th key besides).</summary>
    public int Limit => _limit;

    /// <summary>Entries held now; at most 2K unless a collision at the threshold needs more.</summary>
    public int Entries => _entries;

    /// <summary>Room for entries now allocated.</summary>
    public int Capacity => _hashes.Length;

    /// <summary>Adds one batch's rows: the values of <paramref name="features"/> (joint order) and the weights; non-finite rows are passed over (the caller counts them).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Add(FeatureView view, IReadOnlyList<int> features)
    {
        if (features.Count != _width) throw new ArgumentException($"{features.Count} features for a subsample of {_width}.", nameof(features));
        var weights = view.Weights;
        Span<double> row = stackalloc double[_width];
        for (var start = 0; start < view.Rows; start += ChunkRows)
        {
            var n = Math.Min(ChunkRows, view.Rows - start);
            var hashes = _chunkHashes.AsSpan(0, n);
            JointRowHash.Begin(hashes);
            for (var k = 0; k < _width; k++) JointRowHash.Mix(view.Feature(features[k]).Slice(start, n), hashes);
            JointRowHash.End(hashes);
            for (var r = 0; r < n; r++)
            {
                if (JointRowHash.SelectionKey(hashes[r]) > _threshold) continue;
                var finite = true;
                for (var k = 0; k < _width; k++)
                {
                    var x = view.Feature(features[k])[start + r];
                    finite &= double.IsFinite(x);
                    row[k] = x;
                }
                if (!finite) continue;
                Append(hashes[r], row, 1, weights.IsEmpty ? 1.0 : weights[start + r], null);
            }
        }
    }

    /// <summary>Adds another subsample of the same width and K (another shard): the union of both, cut back to its K smallest entries.</summary>
    public void Merge(KernelSubsample other)
    {
        if (other._width != _width || other._limit != _limit)
            throw new ArgumentException($"A subsample of {other._width} features and K = {other._limit} merged into one of {_width} and K = {_limit}.", nameof(other));
        other.Prune();
        for (var e = 0; e < other._entries; e++)
            Append(other._hashes[e], other._values.AsSpan(e * _width, _width), other._counts[e], other._weights[e], other._joined[e]);
        Prune();
    }

    /// <summary>
    /// The entries kept, after joining equal rows and cutting back to the K smallest keys (ties kept), in canonical
    /// order, as a state for a partial: raw values, row counts, and the exact terms of Σw and Σw² of each entry.
    /// </summary>
    public KernelSubsampleState State()
    {
        Prune();
        var order = CanonicalOrder();
        var values = new double[_entries * _width];
        var counts = new long[_entries];
        var weights = new IReadOnlyList<double>[_entries];
        var squares = new IReadOnlyList<double>[_entries];
        for (var i = 0; i < order.Length; i++)
        {
            var e = order[i];
            _values.AsSpan(e * _width, _width).CopyTo(values.AsSpan(i * _width));
            counts[i] = _counts[e];
            (weights[i], squares[i]) = _joined[e] is { } j ? (j.Weights.Terms.ToArray(), j.Squares.Terms.ToArray()) : ([_weights[e]], [_weights[e] * _weights[e]]);
        }
        return new KernelSubsampleState(_limit, _width, values, counts, weights, squares);
    }

    /// <summary>
    /// Adds a state <see cref="State"/> gave (a partial's entries) into this subsample, the hashes computed again from
    /// the values; the name of what does not fit (another K or width, a non-finite value or weight term, a count below
    /// one), or null when it fits.
    /// </summary>
    public string? AddState(KernelSubsampleState state)
    {
        if (state.Limit != _limit) return $"a kernel subsample of at most {state.Limit} rows, this contract keeps {_limit}";
        if (state.Width != _width) return $"a kernel subsample of {state.Width} features, the joint block has {_width}";
        var entries = state.Counts.Count;
        if (state.Values.Count != entries * _width || state.WeightTerms.Count != entries || state.SquareTerms.Count != entries)
            return "a kernel subsample whose values, counts and weights differ in length";
        var values = state.Values.ToArray();
        for (var e = 0; e < entries; e++)
        {
            var row = values.AsSpan(e * _width, _width);
            foreach (var x in row)
                if (!double.IsFinite(x)) return "a kernel subsample row with a non-finite value";
            if (state.Counts[e] < 1) return "a kernel subsample entry of fewer than one row";
            if (state.WeightTerms[e].Concat(state.SquareTerms[e]).Any(t => !double.IsFinite(t)) || state.SquareTerms[e].Any(t => t < 0))
                return "a kernel subsample entry with a non-finite weight or a negative squared weight";
            var sums = (Weights: new ExactSum(), Squares: new ExactSum());
            foreach (var t in state.WeightTerms[e]) sums.Weights.Add(t);
            foreach (var t in state.SquareTerms[e]) sums.Squares.Add(t);
            Append(JointRowHash.Of(row), row, state.Counts[e], 0, sums);
        }
        Prune();
        return null;
    }

    /// <summary>
    /// The kernel's feature-map sums of the kept rows, standardised by <paramref name="means"/> and
    /// <paramref name="standardDeviations"/>, one set per block (the hash's low bits, see <see cref="JointRowHash.Block"/>),
    /// each entry added in canonical order with its count and its Σw and Σw² rounded once from their exact sums; and
    /// the rows they hold.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public (CubicKernelFeatureSums[] Blocks, long Rows) Sums(IReadOnlyList<double> means, IReadOnlyList<double> standardDeviations, int blocks)
    {
        Prune();
        var sums = Enumerable.Range(0, blocks).Select(_ => new CubicKernelFeatureSums(_width)).ToArray();
        var row = new double[_width];
        long rows = 0;
        foreach (var e in CanonicalOrder())
        {
            for (var k = 0; k < _width; k++) row[k] = (_values[e * _width + k] - means[k]) / standardDeviations[k];
            var (w, w2) = _joined[e] is { } j ? (j.Weights.Value, j.Squares.Value) : (_weights[e], _weights[e] * _weights[e]);
            sums[JointRowHash.Block(_hashes[e]) % blocks].Add(row, w, w2, _counts[e]);
            rows += _counts[e];
        }
        return (sums, rows);
    }

    /// <summary>Rows held now (each entry's count).</summary>
    public long Rows()
    {
        long rows = 0;
        for (var e = 0; e < _entries; e++) rows += _counts[e];
        return rows;
    }

    private void Append(ulong hash, ReadOnlySpan<double> row, long count, double weight, (ExactSum, ExactSum)? joined)
    {
        if (JointRowHash.SelectionKey(hash) > _threshold) return;
        if (_entries == _hashes.Length)
        {
            MakeRoom();
            if (JointRowHash.SelectionKey(hash) > _threshold) return;
        }
        var at = _entries++;
        _hashes[at] = hash;
        var held = _values.AsSpan(at * _width, _width);
        for (var k = 0; k < _width; k++) held[k] = row[k] == 0 ? 0.0 : row[k]; // −0 and +0 are one value
        _counts[at] = count;
        _weights[at] = weight;
        _joined[at] = joined;
    }

    /// <summary>Grows the store up to 2K entries; at 2K joins equal rows and cuts back to the K smallest, growing only when that frees too little.</summary>
    private void MakeRoom()
    {
        if (_hashes.Length < 2L * _limit)
        {
            Grow((int)Math.Min(2L * _limit, 2L * _hashes.Length));
            return;
        }
        Prune();
        if (_entries > _hashes.Length * 3L / 4) Grow(2 * _hashes.Length);
    }

    private void Grow(int capacity)
    {
        Array.Resize(ref _hashes, capacity);
        Array.Resize(ref _values, capacity * _width);
        Array.Resize(ref _counts, capacity);
        Array.Resize(ref _weights, capacity);
        Array.Resize(ref _joined, capacity);
    }

    /// <summary>
    /// Joins entries of equal values (counts added, weights and squared weights into exact sums, kept in the entry
    /// first in canonical order), sets the threshold to the K-th smallest key when more than K entries are held, drops
    /// every entry above it, and closes the gaps in place (no second copy of the store).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Prune()
    {
        var n = _entries;
        var order = CanonicalOrder();
        var alive = new bool[n];
        var distinct = 0;
        var leader = -1;
        var cut = ulong.MaxValue;
        for (var i = 0; i < n; i++)
        {
            var e = order[i];
            if (leader >= 0 && _hashes[leader] == _hashes[e] && CompareValues(leader, e) == 0)
            {
                // The same values as the entry before: one entry, its rows and weights added exactly.
                _joined[leader] ??= ExactSums(_counts[leader], _weights[leader], null);
                var (w, w2) = _joined[leader]!.Value;
                var (ow, ow2) = ExactSums(_counts[e], _weights[e], _joined[e]);
                w.Add(ow);
                w2.Add(ow2);
                _counts[leader] += _counts[e];
                continue;
            }
            leader = e;
            alive[e] = true;
            if (++distinct == _limit) cut = JointRowHash.SelectionKey(_hashes[e]);
        }
        if (distinct > _limit) _threshold = Math.Min(_threshold, cut);
        var kept = 0;
        for (var e = 0; e < n; e++)
        {
            if (!alive[e] || JointRowHash.SelectionKey(_hashes[e]) > _threshold) continue;
            if (kept != e)
            {
                _hashes[kept] = _hashes[e];
                _values.AsSpan(e * _width, _width).CopyTo(_values.AsSpan(kept * _width, _width));
                _counts[kept] = _counts[e];
                _weights[kept] = _weights[e];
                _joined[kept] = _joined[e];
            }
            kept++;
        }
        for (var e = kept; e < n; e++) _joined[e] = null;
        _entries = kept;
    }

    /// <summary>The entries' indices by hash, then by the values' bits (equal hashes are copies of one row or a collision: short runs).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private int[] CanonicalOrder()
    {
        var n = _entries;
        var order = new int[n];
        var keys = new ulong[n];
        for (var e = 0; e < n; e++) (keys[e], order[e]) = (_hashes[e], e);
        Array.Sort(keys, order);
        for (var start = 0; start < n;)
        {
            var end = start + 1;
            while (end < n && keys[end] == keys[start]) end++;
            if (end - start > 1) Array.Sort(order, start, end - start, Comparer<int>.Create(CompareValues));
            start = end;
        }
        return order;
    }

    /// <summary>An entry's weights as exact sums (a single row's w and w·w as one term each).</summary>
    private static (ExactSum Weights, ExactSum Squares) ExactSums(long count, double weight, (ExactSum Weights, ExactSum Squares)? joined)
    {
        if (joined is { } j) return j;
        if (count != 1) throw new InvalidOperationException("An entry of several rows without exact sums.");
        var sums = (Weights: new ExactSum(), Squares: new ExactSum());
        sums.Weights.Add(weight);
        sums.Squares.Add(weight * weight);
        return sums;
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private int CompareValues(int a, int b)
    {
        for (var k = 0; k < _width; k++)
        {
            var c = BitConverter.DoubleToInt64Bits(_values[a * _width + k]).CompareTo(BitConverter.DoubleToInt64Bits(_values[b * _width + k]));
            if (c != 0) return c;
        }
        return 0;
    }
}
