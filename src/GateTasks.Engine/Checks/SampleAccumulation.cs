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
    private readonly FeatureStatistics[] _stats; // replaced when read from a partial file
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

    /// <summary>Events (after the selection) with a negative weight: none means every cell's Σw² is at most its (Σw)².</summary>
    public long NegativeWeightEvents { get; private set; }
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
            foreach (var w in view.Weights)
                if (w < 0) NegativeWeightEvents++;
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
        NegativeWeightEvents += other.NegativeWeightEvents;
        _sumW.Add(other._sumW);
        _sumW2.Add(other._sumW2);
    }

    /// <summary>Writes the whole accumulation (exact sums as their partials) into a partial file.</summary>
    public void WriteState(System.Text.Json.Utf8JsonWriter w)
    {
        w.WriteStartObject();
        w.WriteNumber("events", Events);
        w.WriteNumber("negative_weight_events", NegativeWeightEvents);
        Partials.PartialNumbers.WriteArray(w, "sum_w", _sumW.Partials);
        Partials.PartialNumbers.WriteArray(w, "sum_w2", _sumW2.Partials);
        w.WriteStartArray("features");
        for (var i = 0; i < _histograms.Length; i++)
        {
            w.WriteStartObject();
            w.WriteString("name", Contract.Features[i].Name);
            w.WritePropertyName("histogram");
            _histograms[i].WriteState(w);
            Partials.PartialNumbers.WriteArray(w, "statistics", _stats[i].State());
            if (_spikes[i] is { } spike)
            {
                var (entries, sw, sw2) = spike.State();
                w.WriteNumber("spike_entries", entries);
                Partials.PartialNumbers.WriteArray(w, "spike_w", sw);
                Partials.PartialNumbers.WriteArray(w, "spike_w2", sw2);
            }
            if (_farTail[i] is { } tail) Partials.PartialNumbers.WriteJagged(w, "far_tail", tail.State());
            w.WriteEndObject();
        }
        w.WriteEndArray();
        w.WriteStartArray("pairs");
        foreach (var p in Pairs) p.WriteState(w);
        w.WriteEndArray();
        if (Joint is not null)
        {
            w.WriteStartObject("joint");
            w.WriteNumber("seen", Joint.Seen);
            Partials.PartialNumbers.WriteJagged(w, "rows", Joint.Rows);
            w.WriteEndObject();
        }
        w.WriteEndObject();
    }

    /// <summary>
    /// Reads an accumulation written by <see cref="WriteState"/> into this fresh one; the name of what does not fit
    /// this contract and reference, or null when it all fits.
    /// </summary>
    public string? ReadState(System.Text.Json.JsonElement e)
    {
        var features = e.GetProperty("features").EnumerateArray().ToList();
        if (features.Count != _histograms.Length) return $"{features.Count} features, the contract has {_histograms.Length}";
        for (var i = 0; i < features.Count; i++)
        {
            var f = features[i];
            var name = Contract.Features[i].Name;
            if (f.GetProperty("name").GetString() != name) return $"feature {i + 1} is '{f.GetProperty("name").GetString()}', the contract's is '{name}'";
            if (!_histograms[i].ReadState(f.GetProperty("histogram"))) return $"feature '{name}' has another binning";
            _stats[i] = FeatureStatistics.Restore(Partials.PartialNumbers.ReadArray(f.GetProperty("statistics")));
            if (_spikes[i] is { } spike)
            {
                if (!f.TryGetProperty("spike_entries", out var se)) return $"feature '{name}' has no spike tally";
                spike.AddState(se.GetInt64(), Partials.PartialNumbers.ReadArray(f.GetProperty("spike_w")), Partials.PartialNumbers.ReadArray(f.GetProperty("spike_w2")));
            }
            if (_farTail[i] is { } tail)
            {
                if (!f.TryGetProperty("far_tail", out var ft)) return $"feature '{name}' has no far-tail counts";
                tail.AddState(Partials.PartialNumbers.ReadJagged(ft));
            }
        }
        var pairs = e.GetProperty("pairs").EnumerateArray().ToList();
        if (pairs.Count != Pairs.Count) return $"{pairs.Count} correlation pairs, the contract has {Pairs.Count}";
        for (var p = 0; p < pairs.Count; p++)
            if (!Pairs[p].ReadState(pairs[p])) return $"correlation pair {Pairs[p].Spec.Name} does not fit";
        if (Joint is not null)
        {
            if (!e.TryGetProperty("joint", out var j)) return "no joint subsample";
            Joint.Restore(Partials.PartialNumbers.ReadJagged(j.GetProperty("rows")), j.GetProperty("seen").GetInt64());
        }
        Events = e.GetProperty("events").GetInt64();
        NegativeWeightEvents = e.GetProperty("negative_weight_events").GetInt64();
        foreach (var v in Partials.PartialNumbers.ReadArray(e.GetProperty("sum_w"))) _sumW.Add(v);
        foreach (var v in Partials.PartialNumbers.ReadArray(e.GetProperty("sum_w2"))) _sumW2.Add(v);
        return null;
    }

    /// <summary>Feature <paramref name="i"/>'s histogram, its cells rounded once from their exact sums.</summary>
    public Histogram Histogram(int i) => _histograms[i].ToHistogram();

    public FeatureSummary Summary(int i) => _stats[i].Summary();

    public SpikeTally? Spike(int i) => _spikes[i]?.Tally;

    public FarTailCounts? FarTail(int i) => _farTail[i]?.Counts;
}
