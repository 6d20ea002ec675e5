using GateTasks.Engine.Contracts;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Puts a feature's declared spike apart before its values reach an accumulator: the values exactly equal to the spike
/// are only tallied (<see cref="SpikeFilter"/>), the rest go on to the histogram and the continuous statistics. The
/// whole-batch view (pairs, the joint block) keeps the spikes.
/// </summary>
internal sealed class SpikeSeparation
{
    private readonly SpikeFilter?[] _filters;

    public SpikeSeparation(IReadOnlyList<FeatureSpec> features)
    {
        _filters = features.Select(f => f.Spike is { } v ? new SpikeFilter(v) : null).ToArray();
    }

    /// <summary>Per feature, its filter with the tally so far (null where no spike is declared).</summary>
    public IReadOnlyList<SpikeFilter?> Filters => _filters;

    /// <summary>
    /// The visitor that hands <paramref name="visit"/> each feature's values without its spike. Features may be visited
    /// side by side: each touches only its own filter.
    /// </summary>
    public FeatureBatch Around(FeatureBatch visit) => (i, values, weights) =>
    {
        if (_filters[i] is { } spike)
        {
            var (v, w) = spike.Apply(values, weights);
            visit(i, v.Span, w.Span);
        }
        else visit(i, values, weights);
    };
}
