using GateTasks.Engine.Contracts;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Everything a check gathers from the surrogate sample, before any decision: per feature the histogram on the
/// reference's binning, moments, spike and far-tail tallies; per declared pair the coefficients and 2-D cells; the
/// joint subsample; the event totals. Accumulations of shards of one sample merge into that of the whole: histogram
/// cells, tallies and totals exactly (they are exact sums), moments and coefficients to rounding (Chan, Golub &amp;
/// LeVeque 1979), the joint subsample as a valid uniform subsample of the union (not the one a single pass keeps).
/// </summary>
internal sealed class SampleAccumulation
{
    /// <summary>Seed of the sample's joint subsample.</summary>
    private const int JointSeed = 7_654_321;

    private readonly Histogram[] _batch;
    private readonly ExactHistogram[] _histograms;
    private readonly FeatureStatistics[] _stats;
    private readonly FarTailCounter?[] _farTail;
    private readonly SpikeFilter?[] _spikes;
    private readonly ExactSum _sumW = new();
    private readonly ExactSum _sumW2 = new();

    public SampleAccumulation(PrecisionContract contract, IReadOnlyList<ReferenceFeature> references)
    {
        Contract = contract;
        _batch = references.Select(r => new Histogram(r.Histogram.Axis)).ToArray();
        _histograms = references.Select(r => new ExactHistogram(r.Histogram.Axis)).ToArray();
        _stats = contract.Features.Select(_ => new FeatureStatistics()).ToArray();
        _farTail = contract.Features.Select((f, i) => f.Checks.Any(c => c.Kind == CheckKind.FarTail) && references[i].FarTail is { } t
            ? new FarTailCounter(t.Low, t.High) : null).ToArray();
        _spikes = contract.Features.Select(f => f.Spike is { } v ? new SpikeFilter(v) : null).ToArray();
        var index = contract.Features.Select((f, i) => (f.Name, i)).ToDictionary(p => p.Name, p => p.i);
        Joint = contract.Joint is { } js ? new JointSubsample(js.Features.Select(f => index[f]).ToList(), js.Subsample, JointSeed) : null;
        Pairs = contract.Pairs.Select(p => new PairCorrelation(p, index[p.First], index[p.Second],
            new MarginalCdf(references[index[p.First]].Histogram), new MarginalCdf(references[index[p.Second]].Histogram),
            p.Chi2 is null ? null : new Histogram2D(references[index[p.First]].Histogram.Axis, references[index[p.Second]].Histogram.Axis))).ToList();
    }

    public PrecisionContract Contract { get; }
    public IReadOnlyList<PairCorrelation> Pairs { get; }
    public JointSubsample? Joint { get; }
    public long Events { get; private set; }
    public double SumW => _sumW.Value;
    public double SumW2 => _sumW2.Value;

    /// <summary>Streams a sample (one pass, batch by batch) into the accumulation.</summary>
    public void Read(Sample sample, FeatureInputs inputs)
    {
        var totals = SampleStream.Run(sample, inputs, Contract.Sample.Weight, (i, values, weights) =>
        {
            // Each batch fills a plain histogram, then is added exactly, so the cells do not depend on the batching.
            _batch[i].Fill(values, weights);
            _histograms[i].Absorb(_batch[i]);
            _stats[i].Add(values, weights);
            _farTail[i]?.Add(values, weights);
        }, view =>
        {
            foreach (var p in Pairs) p.Add(view);
            Joint?.Add(view);
        });
        Events += totals.Events;
        _sumW.Add(totals.ExactSumW!);
        _sumW2.Add(totals.ExactSumW2!);
        for (var i = 0; i < _spikes.Length; i++)
            if (_spikes[i] is { } mine && totals.SpikeFilters![i] is { } read) mine.Merge(read);
    }

    /// <summary>Adds another accumulation of the same contract and reference (another shard of the sample).</summary>
    public void Merge(SampleAccumulation other)
    {
        for (var i = 0; i < _histograms.Length; i++)
        {
            _histograms[i].Add(other._histograms[i]);
            _stats[i].Merge(other._stats[i]);
            if (_farTail[i] is { } f) f.Merge(other._farTail[i]!);
            if (_spikes[i] is { } s) s.Merge(other._spikes[i]!);
        }
        for (var p = 0; p < Pairs.Count; p++) Pairs[p].Merge(other.Pairs[p]);
        if (Joint is not null) Joint.Merge(other.Joint!);
        Events += other.Events;
        _sumW.Add(other._sumW);
        _sumW2.Add(other._sumW2);
    }

    /// <summary>Feature <paramref name="i"/>'s histogram, its cells rounded once from their exact sums.</summary>
    public Histogram Histogram(int i) => _histograms[i].ToHistogram();

    public FeatureSummary Summary(int i) => _stats[i].Summary();

    public SpikeTally? Spike(int i) => _spikes[i]?.Tally;

    public FarTailCounts? FarTail(int i) => _farTail[i]?.Counts;
}
