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
    private readonly BlockedCovariance? _moments;
    private readonly CubicKernelFeatureSums[]? _kernel;
    private readonly KernelSubsample? _subsample;
    private readonly double[] _row;
    // One batch's kept rows, standardised, by column; their weights and blocks. Grown to the largest batch, then reused.
    private double[][] _columns;
    private double[] _weights = [];
    private int[] _blocks = [];

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
        var d = _features.Length;
        _moments = moments ? new BlockedCovariance(d, Blocks) : null;
        _kernel = kernel && kernelRows == 0 ? Enumerable.Range(0, Blocks).Select(_ => new CubicKernelFeatureSums(d)).ToArray() : null;
        _subsample = kernel && kernelRows > 0 ? new KernelSubsample(d, kernelRows) : null;
        _row = new double[d];
        _columns = new double[d][];
        for (var k = 0; k < d; k++) _columns[k] = [];
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
        if (_weights.Length < n)
        {
            _weights = new double[n];
            _blocks = new int[n];
            if (_moments is not null)
                for (var k = 0; k < d; k++) _columns[k] = new double[n];
        }
        var weights = view.Weights;
        var fileRows = view.FileRows;
        var kept = 0;
        for (var r = 0; r < n; r++)
        {
            var finite = true;
            for (var k = 0; k < d; k++)
            {
                var x = view.Feature(_features[k])[r];
                finite &= double.IsFinite(x);
                _row[k] = (x - _means[k]) / _sds[k];
            }
            if (!finite)
            {
                Skipped++;
                continue;
            }
            var w = weights.IsEmpty ? 1.0 : weights[r];
            var block = (int)(fileRows[r] % Blocks);
            _kernel?[block].Add(_row, w);
            if (_moments is not null)
            {
                for (var k = 0; k < d; k++) _columns[k][kept] = _row[k];
                _weights[kept] = w;
                _blocks[kept] = block;
            }
            kept++;
        }
        Rows += kept;
        _subsample?.Add(view, _features);
        if (_moments is not null && kept > 0)
        {
            var columns = new ReadOnlyMemory<double>[d];
            for (var k = 0; k < d; k++) columns[k] = _columns[k].AsMemory(0, kept);
            _moments.AddBatch(columns, _weights.AsSpan(0, kept), _blocks.AsSpan(0, kept));
        }
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
