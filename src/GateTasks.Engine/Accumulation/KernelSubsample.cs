using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// The sample rows the kernel distance is computed on: a bottom-K sketch (Cohen &amp; Kaplan 2007, "Summarizing data
/// using bottom-k sketches", PODC) over the joint feature values. Each finite row gets a 64-bit hash of its values
/// (<see cref="JointRowHash"/>); the rows whose selection key (the hash's top 60 bits) is among the K smallest are
/// kept, together with every row whose key ties the K-th, so that copies of one event (an event split into rows of
/// signed weights, equal values) are kept or dropped together. Which rows are kept depends only on the values, never
/// on the order, file, shard or batch they come in: one pass and a merge of shards keep the same rows, and the sums
/// are taken over them in a canonical order (<see cref="Sums"/>), so they agree to the bit. Rows with the same values
/// and weight are held once with their count, which bounds memory for discrete features as well.
/// <para>
/// Streaming: a row whose key is above the current threshold (the K-th smallest key held) is rejected by one
/// comparison; only the few below it are copied. When the store is full (2K entries) it is cut back to its K smallest
/// rows and the threshold drops; about K·(1 + ln(n/K)) rows are ever copied for n rows. Memory is at most 2K entries
/// of d + 3 numbers, whatever n (more only when more than K entries share the K-th key: rows of equal values and
/// distinct weights).
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
    private double[] _weights = new double[InitialCapacity];
    private long[] _counts = new long[InitialCapacity];
    private int[] _next = new int[InitialCapacity];
    private int _entries;
    private readonly Dictionary<ulong, int> _first = [];
    // Keys above this are never kept: at least K rows are held at or below it.
    private ulong _threshold = ulong.MaxValue;
    private readonly ulong[] _chunkHashes = new ulong[ChunkRows];
    private readonly bool[] _finite = new bool[ChunkRows];

    /// <summary>An empty subsample of rows of <paramref name="width"/> features keeping at most <paramref name="limit"/> rows (plus ties).</summary>
    public KernelSubsample(int width, int limit)
    {
        if (width < 1) throw new ArgumentOutOfRangeException(nameof(width), width, "Rows need at least one feature.");
        if (limit < 1) throw new ArgumentOutOfRangeException(nameof(limit), limit, "At least one row is kept.");
        _width = width;
        _limit = limit;
        _values = new double[InitialCapacity * width];
    }

    /// <summary>K: the rows kept (ties at the K-th key besides).</summary>
    public int Limit => _limit;

    /// <summary>Entries held now (distinct value rows with their weight); at most 2K unless ties at the threshold need more.</summary>
    public int Entries => _entries;

    /// <summary>Room for entries now allocated.</summary>
    public int Capacity => _hashes.Length;

    /// <summary>Adds one batch's rows: the values of <paramref name="features"/> (joint order) and the weights; non-finite rows are passed over (the caller counts them).</summary>
    public void Add(FeatureView view, IReadOnlyList<int> features)
    {
        if (features.Count != _width) throw new ArgumentException($"{features.Count} features for a subsample of {_width}.", nameof(features));
        var weights = view.Weights;
        Span<double> row = stackalloc double[_width];
        for (var start = 0; start < view.Rows; start += ChunkRows)
        {
            var n = Math.Min(ChunkRows, view.Rows - start);
            var hashes = _chunkHashes.AsSpan(0, n);
            var finite = _finite.AsSpan(0, n);
            JointRowHash.Begin(hashes, finite);
            for (var k = 0; k < _width; k++) JointRowHash.Mix(view.Feature(features[k]).Slice(start, n), hashes, finite);
            JointRowHash.End(hashes);
            for (var r = 0; r < n; r++)
            {
                if (JointRowHash.SelectionKey(hashes[r]) > _threshold || !finite[r]) continue;
                for (var k = 0; k < _width; k++) row[k] = view.Feature(features[k])[start + r];
                Keep(hashes[r], row, weights.IsEmpty ? 1.0 : weights[start + r], 1);
            }
        }
    }

    /// <summary>Adds another subsample of the same width and K (another shard): the union of both, cut back to its K smallest rows.</summary>
    public void Merge(KernelSubsample other)
    {
        if (other._width != _width || other._limit != _limit)
            throw new ArgumentException($"A subsample of {other._width} features and K = {other._limit} merged into one of {_width} and K = {_limit}.", nameof(other));
        for (var e = 0; e < other._entries; e++)
            Keep(other._hashes[e], other._values.AsSpan(e * _width, _width), other._weights[e], other._counts[e]);
        Prune();
    }

    /// <summary>The rows kept, after cutting back to the K smallest keys (ties kept), as a state for a partial: raw values, weights and counts in canonical order.</summary>
    public KernelSubsampleState State()
    {
        Prune();
        var order = CanonicalOrder();
        var values = new double[order.Length * _width];
        var weights = new double[order.Length];
        var counts = new long[order.Length];
        for (var i = 0; i < order.Length; i++)
        {
            _values.AsSpan(order[i] * _width, _width).CopyTo(values.AsSpan(i * _width));
            weights[i] = _weights[order[i]];
            counts[i] = _counts[order[i]];
        }
        return new KernelSubsampleState(_limit, _width, values, weights, counts);
    }

    /// <summary>
    /// Adds a state <see cref="State"/> gave (a partial's rows) into this subsample, the hashes computed again from the
    /// values; the name of what does not fit (another K or width, a non-finite value or weight, a count below one),
    /// or null when it fits.
    /// </summary>
    public string? AddState(KernelSubsampleState state)
    {
        if (state.Limit != _limit) return $"a kernel subsample of at most {state.Limit} rows, this contract keeps {_limit}";
        if (state.Width != _width) return $"a kernel subsample of {state.Width} features, the joint block has {_width}";
        var entries = state.Weights.Count;
        if (state.Values.Count != entries * _width || state.Counts.Count != entries) return "a kernel subsample whose values, weights and counts differ in length";
        var values = state.Values.ToArray();
        for (var e = 0; e < entries; e++)
        {
            var row = values.AsSpan(e * _width, _width);
            foreach (var x in row)
                if (!double.IsFinite(x)) return "a kernel subsample row with a non-finite value";
            if (!double.IsFinite(state.Weights[e]) || state.Counts[e] < 1) return "a kernel subsample row with a non-finite weight or a count below one";
            Keep(JointRowHash.Of(row), row, state.Weights[e], state.Counts[e]);
        }
        Prune();
        return null;
    }

    /// <summary>
    /// The kernel's feature-map sums of the kept rows, standardised by <paramref name="means"/> and
    /// <paramref name="standardDeviations"/>, one set per block (the hash's low bits, see <see cref="JointRowHash.Block"/>),
    /// each row added in canonical order: by hash, then by the values' bits, then by the weight's bits. With the rows
    /// kept, the order fixed too, the sums do not depend on how the sample was cut into files, shards or batches.
    /// </summary>
    public (CubicKernelFeatureSums[] Blocks, long Rows) Sums(IReadOnlyList<double> means, IReadOnlyList<double> standardDeviations, int blocks)
    {
        Prune();
        var sums = Enumerable.Range(0, blocks).Select(_ => new CubicKernelFeatureSums(_width)).ToArray();
        var row = new double[_width];
        long rows = 0;
        foreach (var e in CanonicalOrder())
        {
            for (var k = 0; k < _width; k++) row[k] = (_values[e * _width + k] - means[k]) / standardDeviations[k];
            sums[JointRowHash.Block(_hashes[e]) % blocks].Add(row, _weights[e], _counts[e]);
            rows += _counts[e];
        }
        return (sums, rows);
    }

    /// <summary>Rows held now (each entry's count), before or after the cut.</summary>
    public long Rows()
    {
        long rows = 0;
        for (var e = 0; e < _entries; e++) rows += _counts[e];
        return rows;
    }

    private void Keep(ulong hash, ReadOnlySpan<double> row, double weight, long count)
    {
        if (JointRowHash.SelectionKey(hash) > _threshold) return;
        if (weight == 0) weight = 0.0; // −0 and +0 are one weight
        // The same values and weight already held: one more of them.
        if (_first.TryGetValue(hash, out var e))
            for (; e >= 0; e = _next[e])
                if (SameRow(e, row, weight))
                {
                    _counts[e] += count;
                    return;
                }
        if (_entries == _hashes.Length)
        {
            MakeRoom();
            if (JointRowHash.SelectionKey(hash) > _threshold) return;
        }
        var at = _entries++;
        _hashes[at] = hash;
        var held = _values.AsSpan(at * _width, _width);
        for (var k = 0; k < _width; k++) held[k] = row[k] == 0 ? 0.0 : row[k];
        _weights[at] = weight;
        _counts[at] = count;
        _next[at] = _first.TryGetValue(hash, out var head) ? head : -1;
        _first[hash] = at;
    }

    private bool SameRow(int e, ReadOnlySpan<double> row, double weight)
    {
        if (Bits(_weights[e]) != Bits(weight)) return false;
        var held = _values.AsSpan(e * _width, _width);
        for (var k = 0; k < _width; k++)
            if (Bits(held[k]) != Bits(row[k])) return false;
        return true;
    }

    /// <summary>Grows the store up to 2K entries; at 2K cuts it back to the K smallest rows, growing only when ties fill it still.</summary>
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
        Array.Resize(ref _weights, capacity);
        Array.Resize(ref _counts, capacity);
        Array.Resize(ref _next, capacity);
    }

    /// <summary>
    /// Sets the threshold to the K-th smallest key over the rows held (counting each entry's rows) and drops every entry
    /// above it; with fewer than K rows held nothing changes.
    /// </summary>
    private void Prune()
    {
        if (Rows() <= _limit) return;
        var keys = new ulong[_entries];
        var order = new int[_entries];
        for (var e = 0; e < _entries; e++) (keys[e], order[e]) = (JointRowHash.SelectionKey(_hashes[e]), e);
        Array.Sort(keys, order);
        long rows = 0;
        var cut = 0;
        while (rows < _limit) rows += _counts[order[cut++]];
        _threshold = Math.Min(_threshold, keys[cut - 1]);
        var kept = 0;
        for (var e = 0; e < _entries; e++)
        {
            if (JointRowHash.SelectionKey(_hashes[e]) > _threshold) continue;
            if (kept != e)
            {
                _hashes[kept] = _hashes[e];
                _values.AsSpan(e * _width, _width).CopyTo(_values.AsSpan(kept * _width, _width));
                _weights[kept] = _weights[e];
                _counts[kept] = _counts[e];
            }
            kept++;
        }
        _entries = kept;
        _first.Clear();
        for (var e = 0; e < _entries; e++)
        {
            _next[e] = _first.TryGetValue(_hashes[e], out var head) ? head : -1;
            _first[_hashes[e]] = e;
        }
    }

    /// <summary>Entries by hash, then the values' bits, then the weight's bits (no two entries are equal in all).</summary>
    private int[] CanonicalOrder()
    {
        var order = Enumerable.Range(0, _entries).ToArray();
        Array.Sort(order, (a, b) =>
        {
            var c = _hashes[a].CompareTo(_hashes[b]);
            for (var k = 0; c == 0 && k < _width; k++)
                c = Bits(_values[a * _width + k]).CompareTo(Bits(_values[b * _width + k]));
            return c != 0 ? c : Bits(_weights[a]).CompareTo(Bits(_weights[b]));
        });
        return order;
    }

    private static long Bits(double x) => BitConverter.DoubleToInt64Bits(x == 0 ? 0.0 : x);
}
