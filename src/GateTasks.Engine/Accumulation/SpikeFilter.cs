
namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Splits a feature's values into those exactly equal to a declared spike value, which are only tallied, and the
/// rest, which are handed on compacted for the histogram and the continuous statistics. Buffers are reused
/// across batches.
/// </summary>
internal sealed class SpikeFilter(double value)
{
    private double[] _values = [];
    private double[] _weights = [];
    private long _entries;
    // Summed per batch, then exactly, so the tally does not depend on how batches are grouped into shards.
    private readonly Statistics.ExactSum _sumW = new();
    private readonly Statistics.ExactSum _sumW2 = new();

    public SpikeTally Tally => new(value, _entries, _sumW.Value, _sumW2.Value);

    /// <summary>The tally's state: entries, then the exact terms of Σw and of Σw².</summary>
    public SpikeState State() => new(_entries, _sumW.Terms, _sumW2.Terms);

    /// <summary>Adds a tally in the form <see cref="State"/> gives it (another shard's).</summary>
    public void AddState(SpikeState state)
    {
        _entries += state.Entries;
        foreach (var v in state.SumW) _sumW.Add(v);
        foreach (var v in state.SumW2) _sumW2.Add(v);
    }

    /// <summary>Adds another filter's tally (exact).</summary>
    public void Merge(SpikeFilter other)
    {
        _entries += other._entries;
        _sumW.Add(other._sumW);
        _sumW2.Add(other._sumW2);
    }

    /// <summary>The values (and weights, empty for unit weights) other than the spike.</summary>
    public (ReadOnlyMemory<double> Values, ReadOnlyMemory<double> Weights) Apply(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        if (_values.Length < values.Length)
        {
            _values = new double[values.Length];
            _weights = new double[values.Length];
        }
        var kept = 0;
        double sumW = 0, sumW2 = 0;
        for (var i = 0; i < values.Length; i++)
        {
            var w = weights.IsEmpty ? 1.0 : weights[i];
            if (values[i] == value)
            {
                _entries++;
                sumW += w;
                sumW2 += w * w;
                continue;
            }
            _values[kept] = values[i];
            _weights[kept] = w;
            kept++;
        }
        _sumW.Add(sumW);
        _sumW2.Add(sumW2);
        return (_values.AsMemory(0, kept), weights.IsEmpty ? ReadOnlyMemory<double>.Empty : _weights.AsMemory(0, kept));
    }
}
