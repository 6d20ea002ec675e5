using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Streams every row of the joint feature set, standardised by the reference's means and standard deviations, into
/// what the joint tolerance checks need: per-block weighted covariance moments (<see cref="BlockedCovariance"/>, for
/// the Fréchet distance) and per-block weighted sums of the cubic kernel's feature map
/// (<see cref="CubicKernelFeatureSums"/>, for the kernel distance). A row goes to block (its index within its file)
/// mod <see cref="Blocks"/>, so one pass over several files and a merge of the files filled apart put every row in the
/// same block. Rows with a non-finite value in any joint feature are skipped and counted. Everything is a sum, so shards merge; memory depends on d and B, never on the number of events.
/// The kernel sums cover every row for a reference; a sample's are taken at the end over its seeded subsample of at
/// most K rows (<see cref="KernelSubsample"/>, its own blocks from the rows' hashes), which a merge of shards keeps
/// alike. Its memory depends on K and d, not on the number of events either.
/// </summary>
internal sealed class JointMoments
{
    /// <summary>Blocks B: the Fréchet extrapolation's subsets and jackknife, and the kernel distance's block estimates.</summary>
    public const int Blocks = 16;

    private readonly int[] _features;
    private readonly double[] _means;
    private readonly double[] _sds;
    private readonly double[] _inverseSds;
    private readonly BlockedCovariance? _moments;
    private readonly CubicKernelFeatureSums[]? _kernel;
    private readonly KernelSubsample? _subsample;
    private readonly double[] _row;

    // The moments' rows go through a block-interleaved chunk (BlockInterleavedSums): row t of block b at position
    // B·t + b, each feature standardised and centred, |w| of each sign apart. The chunk is folded when a block's rows
    // reach its capacity, the sums into the moments once per batch.
    private const int ChunkRowsPerBlock = 16; // 256 positions: a chunk of 20 features is 40 kB, at home in the first-level cache
    private readonly BlockInterleavedSums? _positive;
    private readonly BlockInterleavedSums? _negative;
    private readonly double[][] _chunk = [];
    private readonly double[] _chunkPositive = [];
    private readonly double[] _chunkNegative = [];
    private readonly int[] _fill = new int[Blocks];
    private readonly double[] _centre;       // in standardised units: the values are taken about it
    private readonly double[] _centreRaw;    // the same in the values' own units
    private readonly double[] _foldMean;
    private readonly double[] _foldComoments;
    private bool _centred;
    private bool _weighted; // the batch has event weights (otherwise every row's is 1)
    private int[] _position = [];
    private bool[] _finite = [];

    /// <summary>
    /// An empty accumulation of the features at <paramref name="features"/> (indices into a <see cref="FeatureView"/>),
    /// standardised by <paramref name="standardisation"/>, gathering moments and/or kernel sums: over every row when
    /// <paramref name="kernelRows"/> is 0 (a reference), over a subsample of at most that many rows otherwise (a sample).
    /// </summary>
    public JointMoments(IReadOnlyList<int> features, JointStandardisation standardisation, bool moments, bool kernel, int kernelRows = 0)
    {
        if (standardisation.Means.Count != features.Count || standardisation.StandardDeviations.Count != features.Count)
            throw new ArgumentException($"A standardisation of {standardisation.Means.Count} features for {features.Count} joint features.", nameof(standardisation));
        _features = features.ToArray();
        _means = standardisation.Means.ToArray();
        _sds = standardisation.StandardDeviations.ToArray();
        _inverseSds = _sds.Select(s => 1 / s).ToArray();
        var d = _features.Length;
        _moments = moments ? new BlockedCovariance(d, Blocks) : null;
        _kernel = kernel && kernelRows == 0 ? Enumerable.Range(0, Blocks).Select(_ => new CubicKernelFeatureSums(d)).ToArray() : null;
        _subsample = kernel && kernelRows > 0 ? new KernelSubsample(d, kernelRows) : null;
        _row = new double[d];
        _centre = new double[d];
        _centreRaw = new double[d];
        _foldMean = new double[d];
        _foldComoments = new double[d * d];
        if (moments)
        {
            _positive = new BlockInterleavedSums(d, Blocks);
            _negative = new BlockInterleavedSums(d, Blocks);
            _chunk = Enumerable.Range(0, d).Select(_ => new double[Blocks * ChunkRowsPerBlock]).ToArray();
            _chunkPositive = new double[Blocks * ChunkRowsPerBlock];
            _chunkNegative = new double[Blocks * ChunkRowsPerBlock];
        }
    }

    /// <summary>Rows taken in (every joint feature finite), whatever their weight.</summary>
    public long Rows { get; private set; }

    /// <summary>Rows skipped because a joint feature was NaN or infinite.</summary>
    public long Skipped { get; private set; }

    /// <summary>The moments (null when not gathered).</summary>
    public BlockedCovariance? Moments => _moments;

    /// <summary>The kernel sums per block over every row (null when not gathered or when taken from a subsample).</summary>
    public IReadOnlyList<CubicKernelFeatureSums>? Kernel => _kernel;

    /// <summary>The sample's kernel subsample (null when not gathered or when the kernel sums cover every row).</summary>
    public KernelSubsample? Subsample => _subsample;

    /// <summary>Adds one batch's rows (after the selection), each with its event weight and its place in its file.</summary>
    public void Add(FeatureView view)
    {
        var n = view.Rows;
        var d = _features.Length;
        if (_finite.Length < n)
        {
            _finite = new bool[n];
            _position = new int[n];
        }
        // Most batches have no missing value: one vectorised test a column, and a row-by-row mask only otherwise.
        var allFinite = true;
        for (var k = 0; k < d && allFinite; k++) allFinite = AllFinite(view.Feature(_features[k]));
        var finite = _finite.AsSpan(0, n);
        finite.Fill(true);
        var kept = n;
        if (!allFinite)
        {
            for (var k = 0; k < d; k++)
            {
                var x = view.Feature(_features[k]);
                for (var r = 0; r < n; r++) finite[r] &= double.IsFinite(x[r]);
            }
            kept = 0;
            foreach (var f in finite) if (f) kept++;
        }
        Skipped += n - kept;
        Rows += kept;
        if (kept == 0) return;
        _subsample?.Add(view, _features);
        if (_kernel is not null) AddKernel(view, finite);
        if (_moments is not null) AddMoments(view, finite, allFinite);
    }

    private void AddKernel(FeatureView view, ReadOnlySpan<bool> finite)
    {
        var d = _features.Length;
        var weights = view.Weights;
        var fileRows = view.FileRows;
        for (var r = 0; r < view.Rows; r++)
        {
            if (!finite[r]) continue;
            for (var k = 0; k < d; k++) _row[k] = (view.Feature(_features[k])[r] - _means[k]) / _sds[k];
            _kernel![(int)(fileRows[r] % Blocks)].Add(_row, weights.IsEmpty ? 1.0 : weights[r]);
        }
    }

    private void AddMoments(FeatureView view, ReadOnlySpan<bool> finite, bool allFinite)
    {
        var n = view.Rows;
        var d = _features.Length;
        var weights = view.Weights;
        var fileRows = view.FileRows;
        _weighted = !weights.IsEmpty;
        Centre(view, finite);
        if (allFinite && n > 0 && fileRows[n - 1] - fileRows[0] == n - 1)
        {
            AddConsecutive(view);
            Fold();
            return;
        }
        var r = 0;
        while (r < n)
        {
            // Place rows until one block's part of the chunk is full, then standardise them column by column.
            var start = r;
            for (; r < n; r++)
            {
                if (!allFinite && !finite[r])
                {
                    _position[r] = -1;
                    continue;
                }
                var b = (int)(fileRows[r] % Blocks);
                var t = _fill[b]++;
                _position[r] = t * Blocks + b;
                if (t + 1 == ChunkRowsPerBlock)
                {
                    r++;
                    break;
                }
            }
            var position = _position.AsSpan(start, r - start);
            for (var k = 0; k < d; k++)
            {
                var x = view.Feature(_features[k]).Slice(start, r - start);
                var column = _chunk[k];
                double centre = _centreRaw[k], scale = _inverseSds[k];
                for (var i = 0; i < position.Length; i++)
                    if (position[i] >= 0) column[position[i]] = (x[i] - centre) * scale;
            }
            for (var i = 0; i < position.Length; i++)
            {
                if (position[i] < 0) continue;
                var w = weights.IsEmpty ? 1.0 : weights[start + i];
                _chunkPositive[position[i]] = w > 0 ? w : 0;
                _chunkNegative[position[i]] = w < 0 ? -w : 0;
            }
            FlushChunk();
        }
        Fold();
    }

    // A batch of consecutive rows of one file, none missing (the common case): row r of the batch lands at position
    // φ + r of the chunk sequence, φ its first row's block, so each chunk is filled by contiguous, vectorised copies.
    private void AddConsecutive(FeatureView view)
    {
        var n = view.Rows;
        var weights = view.Weights;
        var size = Blocks * ChunkRowsPerBlock;
        var phase = (int)(view.FileRows[0] % Blocks);
        for (var chunkStart = 0; chunkStart < phase + n; chunkStart += size)
        {
            var first = Math.Max(chunkStart, phase);          // the first position used, in batch positions
            var end = Math.Min(chunkStart + size, phase + n); // one past the last
            var rows = first - phase;
            var length = end - first;
            var at = first - chunkStart;
            for (var k = 0; k < _features.Length; k++)
                Standardise(view.Feature(_features[k]).Slice(rows, length), _centreRaw[k], _inverseSds[k], _chunk[k].AsSpan(at, length));
            if (weights.IsEmpty)
            {
                _chunkPositive.AsSpan(at, length).Fill(1);
                _chunkNegative.AsSpan(at, length).Clear();
            }
            else
                for (var i = 0; i < length; i++)
                {
                    var w = weights[rows + i];
                    _chunkPositive[at + i] = w > 0 ? w : 0;
                    _chunkNegative[at + i] = w < 0 ? -w : 0;
                }
            // Positions before the first and after the last row of the chunk carry nothing.
            var used = (at + length + Blocks - 1) / Blocks;
            ClearPositions(0, at);
            ClearPositions(at + length, used * Blocks);
            AddChunk(used, !weights.IsEmpty);
        }
    }

    private void ClearPositions(int from, int to)
    {
        if (to <= from) return;
        _chunkPositive.AsSpan(from, to - from).Clear();
        _chunkNegative.AsSpan(from, to - from).Clear();
        foreach (var column in _chunk) column.AsSpan(from, to - from).Clear();
    }

    // (x − c)·s, element by element as the scalar expression rounds it, whatever the vector width.
    private static void Standardise(ReadOnlySpan<double> x, double centre, double scale, Span<double> into)
    {
        var i = 0;
        if (System.Numerics.Vector.IsHardwareAccelerated)
        {
            var c = new System.Numerics.Vector<double>(centre);
            var s = new System.Numerics.Vector<double>(scale);
            for (; i <= x.Length - System.Numerics.Vector<double>.Count; i += System.Numerics.Vector<double>.Count)
                ((new System.Numerics.Vector<double>(x[i..]) - c) * s).CopyTo(into[i..]);
        }
        for (; i < x.Length; i++) into[i] = (x[i] - centre) * scale;
    }

    // The values are taken about the running mean (in the first batch, its first finite row), so that the sums lose
    // no precision to a mean far from zero in the units the standardisation leaves (Chan, Golub & LeVeque 1983).
    private void Centre(FeatureView view, ReadOnlySpan<bool> finite)
    {
        var d = _features.Length;
        if (_moments!.Count > 0)
        {
            var fit = _moments.Fit();
            if (fit.Mean.All(double.IsFinite)) fit.Mean.CopyTo(_centre, 0);
        }
        else if (!_centred)
        {
            var first = finite.IndexOf(true);
            for (var k = 0; k < d; k++) _centre[k] = (view.Feature(_features[k])[first] - _means[k]) * _inverseSds[k];
        }
        _centred = true;
        for (var k = 0; k < d; k++) _centreRaw[k] = _means[k] + _centre[k] * _sds[k];
    }

    private void FlushChunk()
    {
        var rows = 0;
        foreach (var f in _fill) rows = Math.Max(rows, f);
        if (rows == 0) return;
        // Positions no row reached carry nothing.
        for (var b = 0; b < Blocks; b++)
            for (var t = _fill[b]; t < rows; t++)
            {
                var p = t * Blocks + b;
                _chunkPositive[p] = _chunkNegative[p] = 0;
                foreach (var column in _chunk) column[p] = 0;
            }
        AddChunk(rows, _weighted);
        Array.Clear(_fill);
    }

    // The chunk's first B·rows positions into the sums of each sign (negative ones only where there are any).
    private void AddChunk(int rows, bool mayBeNegative)
    {
        _positive!.Add(_chunk, _chunkPositive, rows, unitWeights: !mayBeNegative);
        if (!mayBeNegative) return;
        foreach (var w in _chunkNegative.AsSpan(0, rows * Blocks))
            if (w != 0)
            {
                _negative!.Add(_chunk, _chunkNegative, rows);
                return;
            }
    }

    // Sums about the centre to each block's mean and co-moments, joined to the moments (m = c + Σw·D/W,
    // C = Σw·D Dᵀ − (Σw·D)(Σw·D)ᵀ/W, with D the centred values and c the centre).
    private void Fold()
    {
        var d = _features.Length;
        foreach (var (sums, negative) in new[] { (_positive!, false), (_negative!, true) })
        {
            for (var b = 0; b < Blocks; b++)
            {
                var w = sums.SumOfWeights(b);
                if (sums.Count(b) == 0 || w == 0) continue;
                for (var k = 0; k < d; k++) _foldMean[k] = sums.Sum(k, b) / w;
                for (var p = 0; p < d; p++)
                    for (var q = 0; q <= p; q++)
                        _foldComoments[p * d + q] = _foldComoments[q * d + p] = sums.CrossSum(p, q, b) - w * _foldMean[p] * _foldMean[q];
                for (var k = 0; k < d; k++) _foldMean[k] += _centre[k];
                _moments!.AddMoments(b, negative, sums.Count(b), w, sums.SumOfSquaredWeights(b), _foldMean, _foldComoments);
            }
            sums.Clear();
        }
    }

    // x·0 is 0 for every finite x and NaN otherwise, so one sum tells whether a column holds only finite values.
    private static bool AllFinite(ReadOnlySpan<double> x)
    {
        var acc = System.Numerics.Vector<double>.Zero;
        var i = 0;
        var vectors = System.Runtime.InteropServices.MemoryMarshal.Cast<double, System.Numerics.Vector<double>>(x);
        foreach (var v in vectors) acc += v * System.Numerics.Vector<double>.Zero;
        i = vectors.Length * System.Numerics.Vector<double>.Count;
        var s = System.Numerics.Vector.Sum(acc);
        for (; i < x.Length; i++) s += x[i] * 0;
        return s == 0;
    }

    /// <summary>Adds another accumulation of the same features, standardisation and parts (another shard).</summary>
    public void Merge(JointMoments other)
    {
        _moments?.Merge(other._moments!);
        if (_kernel is not null)
            for (var b = 0; b < Blocks; b++) _kernel[b].Merge(other._kernel![b]);
        _subsample?.Merge(other._subsample!);
        Rows += other.Rows;
        Skipped += other.Skipped;
    }

    /// <summary>The whole accumulation as numbers, for a partial or a reference file.</summary>
    public JointMomentsState State() => new(Rows, Skipped, _moments?.State(), _kernel?.Select(k => (IReadOnlyList<double>)k.State()).ToList(),
        _subsample?.State());

    /// <summary>
    /// Sets a state <see cref="State"/> gave into this fresh accumulation; the name of what does not fit (another
    /// feature count or block count, a part missing or not asked for), or null when it all fits.
    /// </summary>
    public string? SetState(JointMomentsState state)
    {
        if (state.Rows < 0 || state.Skipped < 0) return "negative joint row counts";
        if ((_moments is null) != (state.Moments is null)) return _moments is null ? "joint moments this contract does not ask for" : "no joint moments";
        if ((_kernel is null) != (state.Kernel is null)) return _kernel is null ? "joint kernel sums this contract does not ask for" : "no joint kernel sums";
        if ((_subsample is null) != (state.KernelSubsample is null))
            return _subsample is null ? "a joint kernel subsample this contract does not ask for" : "no joint kernel subsample";
        if (_moments is not null && !_moments.Restore(state.Moments!.ToArray()))
            return $"joint moments not of {_features.Length} features in {Blocks} blocks";
        if (_kernel is not null)
        {
            if (state.Kernel!.Count != Blocks) return $"{state.Kernel.Count} blocks of joint kernel sums, not {Blocks}";
            for (var b = 0; b < Blocks; b++)
                if (!_kernel[b].Restore(state.Kernel[b].ToArray())) return $"joint kernel sums of block {b} not of {_features.Length} features";
        }
        if (_subsample is not null)
        {
            if (_subsample.Entries > 0) return "a joint kernel subsample set into one already filled";
            if (_subsample.AddState(state.KernelSubsample!) is { } misfit) return misfit;
            if (_subsample.Rows() > state.Rows) return $"a joint kernel subsample of {_subsample.Rows()} rows, more than the {state.Rows} joint rows taken in";
        }
        Rows = state.Rows;
        Skipped = state.Skipped;
        return null;
    }

    /// <summary>
    /// The weighted mean and standard deviation of each feature over the rows taken in, in the units of the values
    /// read: the standardisation a reference stores. The caller refuses a spread that is not positive and finite
    /// (the weights cancel, or a feature is constant over the joint rows).
    /// </summary>
    public (double[] Means, double[] StandardDeviations) MeanAndSpread()
    {
        var fit = (_moments ?? throw new InvalidOperationException("No moments gathered.")).Fit();
        var d = _features.Length;
        var sds = new double[d];
        for (var k = 0; k < d; k++) sds[k] = Math.Sqrt(fit.Covariance[k * d + k]) * _sds[k];
        return (fit.Mean.Select((m, k) => _means[k] + m * _sds[k]).ToArray(), sds);
    }

    /// <summary>What was gathered, as fresh objects that share nothing with this accumulation.</summary>
    public AccumulatedJointMoments Finish()
    {
        var finished = AccumulatedJointMoments.From(_features.Length,
            new JointMomentsState(Rows, Skipped, _moments?.State(), _kernel?.Select(k => (IReadOnlyList<double>)k.State()).ToList()));
        if (_subsample is null) return finished;
        var (sums, rows) = _subsample.Sums(_means, _sds, Blocks);
        return finished with { Kernel = sums, KernelRows = rows, KernelLimit = _subsample.Limit };
    }
}
