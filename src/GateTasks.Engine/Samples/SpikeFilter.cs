using GateTasks.Engine.References;

namespace GateTasks.Engine.Samples;

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
    private double _sumW;
    private double _sumW2;

    public SpikeTally Tally => new(value, _entries, _sumW, _sumW2);

    /// <summary>The values (and weights, empty for unit weights) other than the spike.</summary>
    public (ReadOnlyMemory<double> Values, ReadOnlyMemory<double> Weights) Apply(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        if (_values.Length < values.Length)
        {
            _values = new double[values.Length];
            _weights = new double[values.Length];
        }
        var kept = 0;
        for (var i = 0; i < values.Length; i++)
        {
            var w = weights.IsEmpty ? 1.0 : weights[i];
            if (values[i] == value)
            {
                _entries++;
                _sumW += w;
                _sumW2 += w * w;
                continue;
            }
            _values[kept] = values[i];
            _weights[kept] = w;
            kept++;
        }
        return (_values.AsMemory(0, kept), weights.IsEmpty ? ReadOnlyMemory<double>.Empty : _weights.AsMemory(0, kept));
    }
}
