using GateTasks.Engine.Histograms;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;
using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Everything a check gathers from the surrogate sample, before any decision: per feature the histogram on the
/// reference's binning, moments, spike and far-tail tallies; per declared pair the coefficients and 2-D cells; the
/// joint block's streamed moments and sliced histograms; the event totals. Accumulations of shards of one sample
/// merge into that of the whole: histogram cells, tallies and totals exactly (they are exact sums), moments and
/// coefficients to rounding (Chan, Golub &amp; LeVeque 1979).
/// </summary>
internal sealed class SampleAccumulation
{
    private readonly Histogram[] _batch;
    private readonly ExactHistogram[] _histograms;
    private readonly FeatureStatistics[] _stats; // replaced when a state is set
    // Per feature: an earlier feature given the same values and gathering the same things (the population fractions
    // of category blocks over one 'by'), whose histogram and moments it copies after each read instead of filling its
    // own; -1 for one that fills its own.
    private readonly int[] _copyOf;
    private readonly FarTailCounter?[] _farTail;
    private readonly FineGridCounter?[] _fine;
    private readonly SpikeSeparation _spikes;
    private readonly JointMoments? _jointMoments;
    private readonly SlicedHistogramCounter? _sliced;
    private readonly string? _slicedDigest;
    private readonly int[]? _slicedFeatures;
    private readonly PairAccumulation _pairSet;
    private readonly IReadOnlyList<PairCorrelation> _pairs;
    private readonly ExactSum _sumW = new();
    private readonly ExactSum _sumW2 = new();

    /// <summary>
    /// A fresh accumulation of <paramref name="contract"/>'s features, each on the reference's layout
    /// (<paramref name="layouts"/>, in contract order); a joint block standardises its rows by the reference's
    /// <paramref name="joint"/> (required then: every joint block gathers the moments the global score reads); one with
    /// a sliced check fills its projections on the reference's <paramref name="sliced"/> grid (required then).
    /// </summary>
    public SampleAccumulation(PrecisionContract contract, IReadOnlyList<FeatureLayout> layouts, JointStandardisation? joint = null, SlicedGrid? sliced = null)
    {
        Contract = contract;
        _batch = layouts.Select(r => new Histogram(r.Reference.Axis)).ToArray();
        _histograms = layouts.Select(r => new ExactHistogram(r.Reference.Axis)).ToArray();
        _stats = contract.Features.Select(_ => new FeatureStatistics()).ToArray();
        _farTail = contract.Features.Select((f, i) => f.Checks.Any(c => c.Kind == CheckKind.FarTail) && layouts[i].FarTail is { } t
            ? new FarTailCounter(t.Low, t.High) : null).ToArray();
        _fine = layouts.Select(l => l.FineEdges is { } e ? new FineGridCounter(e) : null).ToArray();
        _spikes = new SpikeSeparation(contract.Features);
        _copyOf = contract.Features.Select((f, i) => Enumerable.Range(0, i).FirstOrDefault(j => GathersAlike(contract.Features, layouts, i, j), -1)).ToArray();
        for (var i = 0; i < _copyOf.Length; i++)
            if (_copyOf[i] >= 0 && _copyOf[_copyOf[i]] >= 0) _copyOf[i] = _copyOf[_copyOf[i]];
        var index = contract.Features.Select((f, i) => (f.Name, i)).ToDictionary(p => p.Name, p => p.i);
        // Covariance moments for every joint block (the global score reads them), kernel sums only for a
        // kernel-distance check, over the sample's subsample of at most kernel-rows rows.
        _jointMoments = contract.Joint is { } jm
            ? new JointMoments(jm.Features.Select(f => index[f]).ToList(),
                joint ?? throw new ArgumentException("The joint block's streamed checks need the reference's standardisation.", nameof(joint)),
                true, jm.KernelDistance is not null, jm.KernelRows)
            : null;
        if (contract.Joint is { Slices: true } slicedSpec)
        {
            var grid = sliced ?? throw new ArgumentException("The joint block's sliced checks need the reference's grid.", nameof(sliced));
            _sliced = grid.Counter();
            _slicedDigest = grid.Digest;
            _slicedFeatures = slicedSpec.Features.Select(f => index[f]).ToArray();
        }
        _pairSet = new PairAccumulation(contract.Pairs, index, i => layouts[i].Reference);
        _pairs = _pairSet.Pairs;
    }

    public PrecisionContract Contract { get; }
    public long Events { get; private set; }

    /// <summary>Events (after the selection) with a negative weight: none means every cell's Σw² is at most its (Σw)².</summary>
    public long NegativeWeightEvents { get; private set; }
    public double SumW => _sumW.Value;
    public double SumW2 => _sumW2.Value;

    /// <summary>Streams a sample (one pass, batch by batch, as <paramref name="pass"/> says) into the accumulation.</summary>
    public void Read(Sample sample, FeatureSources inputs, ReadPass pass)
    {
        var totals = SampleStream.Run(sample, inputs, Contract.Sample.Weight, _spikes.Around((i, values, weights) =>
        {
            if (_copyOf[i] >= 0) return;
            // Each batch fills a plain histogram, then is added exactly, so the cells do not depend on the batching.
            _batch[i].Fill(values, weights);
            _histograms[i].Absorb(_batch[i]);
            _stats[i].Add(values, weights);
            _farTail[i]?.Add(values, weights);
            _fine[i]?.Add(values, weights);
        }), BatchVisits(pass.Parallelism), pass, (i, values) =>
        {
            // Float32 values with unit weights, for a feature with no counter that needs doubles: the same fill and
            // moments, without converting the values.
            if (_spikes.Filters[i] is not null) return false;
            if (_copyOf[i] >= 0) return true;
            // A fine grid's search also finds the histogram's cells, where it can (FineGridCounter.Add).
            if (_fine[i] is not { } fine || !fine.Add(values, _batch[i]))
            {
                _batch[i].Fill(values);
                _fine[i]?.Add(values);
            }
            _histograms[i].Absorb(_batch[i]);
            _stats[i].Add(values);
            _farTail[i]?.Add(values);
            return true;
        });
        for (var i = 0; i < _copyOf.Length; i++)
        {
            if (_copyOf[i] < 0) continue;
            _histograms[i] = _histograms[_copyOf[i]].CopyOn(_histograms[i].Axis);
            _stats[i] = _stats[_copyOf[i]].Copy();
        }
        Events += totals.Events;
        _sumW.Add(totals.ExactSumW);
        _sumW2.Add(totals.ExactSumW2);
    }

    // Whether feature i is given the same values as feature j (the same column or expression, under the same condition)
    // and gathers only what j gathers, on the same binning: then its histogram and moments are j's, to the bit.
    private bool GathersAlike(IReadOnlyList<FeatureSpec> features, IReadOnlyList<FeatureLayout> layouts, int i, int j)
    {
        var (a, b) = (features[i], features[j]);
        return string.Equals(a.Expression, b.Expression, StringComparison.Ordinal)
            && (a.Expression is not null || string.Equals(a.Column, b.Column, StringComparison.Ordinal))
            && string.Equals(a.Condition?.Text, b.Condition?.Text, StringComparison.Ordinal)
            && _spikes.Filters[i] is null && _spikes.Filters[j] is null
            && _farTail[i] is null && _farTail[j] is null && _fine[i] is null && _fine[j] is null
            && layouts[i].Reference.Axis.GetType() == layouts[j].Reference.Axis.GetType()
            && layouts[i].Reference.Axis.SameBinning(layouts[j].Reference.Axis);
    }

    // Each visitor keeps to its own state, so the stream may run them beside each other and beside the features.
    private List<Action<FeatureView>> BatchVisits(int parallelism)
    {
        var visits = new List<Action<FeatureView>>();
        if (_jointMoments is { } joint) visits.Add(joint.Add);
        if (_sliced is { } sliced) visits.Add(view => sliced.Add(view, _slicedFeatures!));
        // Without pairs or weights there is nothing to count: no visitor, so the features' values may be taken as decoded
        // and their memory reused (SampleStream).
        if (_pairs.Count > 0 || Contract.Sample.Weight is not null)
            visits.Add(view =>
            {
                foreach (var w in view.Weights)
                    if (w < 0) NegativeWeightEvents++;
                _pairSet.Add(view, parallelism);
            });
        return visits;
    }

    /// <summary>Adds another accumulation of the same contract and reference (another shard of the sample).</summary>
    public void Merge(SampleAccumulation other)
    {
        for (var i = 0; i < _histograms.Length; i++)
        {
            _histograms[i].Add(other._histograms[i]);
            _stats[i].Merge(other._stats[i]);
            if (_farTail[i] is { } f) f.Merge(other._farTail[i]!);
            if (_fine[i] is { } g) g.Merge(other._fine[i]!);
            if (_spikes.Filters[i] is { } s) s.Merge(other._spikes.Filters[i]!);
        }
        for (var p = 0; p < _pairs.Count; p++) _pairs[p].Merge(other._pairs[p]);
        _jointMoments?.Merge(other._jointMoments!);
        _sliced?.Merge(other._sliced!);
        Events += other.Events;
        NegativeWeightEvents += other.NegativeWeightEvents;
        _sumW.Add(other._sumW);
        _sumW2.Add(other._sumW2);
    }

    /// <summary>The whole accumulation as plain numbers (every exact sum as its terms), for a partial file.</summary>
    public AccumulationState State() => new(Events, NegativeWeightEvents, _sumW.Terms, _sumW2.Terms,
        _histograms.Select((h, i) => new FeatureState(Contract.Features[i].Name, h.State(), _stats[i].State(),
            _spikes.Filters[i]?.State(), _farTail[i]?.State(), _fine[i]?.State())).ToList(),
        _pairs.Select(p => p.State()).ToList(),
        _jointMoments?.State(),
        _sliced is null ? null : new SlicedState(_slicedDigest!, _sliced.State()));

    /// <summary>
    /// Sets a state in the form <see cref="State"/> gives it into this fresh accumulation; the name of what does not fit
    /// this contract and reference, or null when it all fits.
    /// </summary>
    public string? SetState(AccumulationState state)
    {
        var features = state.Features;
        if (features.Count != _histograms.Length) return $"{features.Count} features, the contract has {_histograms.Length}";
        for (var i = 0; i < features.Count; i++)
        {
            var f = features[i];
            var name = Contract.Features[i].Name;
            if (f.Name != name) return $"feature {i + 1} is '{f.Name}', the contract's is '{name}'";
            if (!_histograms[i].AddState(f.Histogram)) return $"feature '{name}' has another binning";
            _stats[i] = FeatureStatistics.Restore(f.Statistics.ToArray());
            if (_spikes.Filters[i] is { } spike)
            {
                if (f.Spike is not { } s) return $"feature '{name}' has no spike tally";
                spike.AddState(s);
            }
            if (_farTail[i] is { } tail)
            {
                if (f.FarTail is not { } ft) return $"feature '{name}' has no far-tail counts";
                tail.AddState(ft);
            }
            if (_fine[i] is { } fine)
            {
                if (f.FineGrid is not { } g) return $"feature '{name}' has no fine-grid cells";
                if (!fine.AddState(g)) return $"feature '{name}' has another fine grid";
            }
            else if (f.FineGrid is not null) return $"feature '{name}' has fine-grid cells this reference does not keep";
        }
        if (state.Pairs.Count != _pairs.Count) return $"{state.Pairs.Count} correlation pairs, the contract has {_pairs.Count}";
        for (var p = 0; p < _pairs.Count; p++)
            if (!_pairs[p].SetState(state.Pairs[p])) return $"correlation pair {_pairs[p].Spec.Name} does not fit";
        if (_jointMoments is not null)
        {
            if (state.JointMoments is not { } jm) return "no joint moments";
            if (_jointMoments.SetState(jm) is { } misfit) return misfit;
        }
        else if (state.JointMoments is not null) return "joint moments this contract does not ask for";
        if (_sliced is not null)
        {
            if (state.Sliced is not { } sl) return "no sliced histograms";
            // A different grid is told apart before this (GATE3026); here only the shape is checked.
            if (sl.GridDigest != _slicedDigest || !_sliced.AddState(sl.Histograms)) return "sliced histograms on another grid";
        }
        else if (state.Sliced is not null) return "sliced histograms this contract does not ask for";
        Events = state.Events;
        NegativeWeightEvents = state.NegativeWeightEvents;
        foreach (var v in state.SumW) _sumW.Add(v);
        foreach (var v in state.SumW2) _sumW2.Add(v);
        return null;
    }

    /// <summary>What was gathered, finished: each exact sum rounded once, nothing shared with this accumulation.</summary>
    public AccumulatedSample Finish() => new(Events, NegativeWeightEvents, SumW, SumW2,
        _histograms.Select((h, i) => new AccumulatedFeature(h.ToHistogram(), _stats[i].Summary(), _spikes.Filters[i]?.Tally, _farTail[i]?.Counts,
            _fine[i]?.Finish())).ToList(),
        _pairs.Select(p => p.Finish()).ToList(),
        _jointMoments?.Finish(),
        _sliced?.Finish());

    /// <summary>The digest of the sliced grid this accumulation fills on, or null without sliced checks.</summary>
    public string? SlicedGridDigest => _slicedDigest;
}
