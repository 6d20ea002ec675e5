
namespace GateTasks.Engine.Accumulation;

/// <summary>Counts, while streaming, the weight strictly below <paramref name="low"/> and strictly above <paramref name="high"/>.</summary>
internal sealed class FarTailCounter(double low, double high)
{
    // Below Σw, Σw²; above Σw, Σw²; total Σw, Σw² — summed per call (one batch), then exactly.
    private readonly Statistics.ExactSum[] _sums = Enumerable.Range(0, 6).Select(_ => new Statistics.ExactSum()).ToArray();

    public void Add(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        double belowW = 0, belowW2 = 0, aboveW = 0, aboveW2 = 0, totalW = 0, totalW2 = 0;
        for (var i = 0; i < values.Length; i++)
        {
            var x = values[i];
            if (double.IsNaN(x)) continue;
            var w = weights.IsEmpty ? 1.0 : weights[i];
            totalW += w;
            totalW2 += w * w;
            if (x < low) { belowW += w; belowW2 += w * w; }
            else if (x > high) { aboveW += w; aboveW2 += w * w; }
        }
        double[] batch = [belowW, belowW2, aboveW, aboveW2, totalW, totalW2];
        for (var k = 0; k < batch.Length; k++) _sums[k].Add(batch[k]);
    }

    /// <summary>The six exact sums (below Σw, Σw²; above Σw, Σw²; total Σw, Σw²), each as its exact terms.</summary>
    public IReadOnlyList<IReadOnlyList<double>> State() => _sums.Select(x => x.Terms).ToList();

    /// <summary>Adds sums in the form <see cref="State"/> gives them (another shard's).</summary>
    public void AddState(IReadOnlyList<IReadOnlyList<double>> state)
    {
        for (var k = 0; k < _sums.Length; k++) foreach (var v in state[k]) _sums[k].Add(v);
    }

    /// <summary>Adds another counter's sums (exact).</summary>
    public void Merge(FarTailCounter other)
    {
        for (var k = 0; k < _sums.Length; k++) _sums[k].Add(other._sums[k]);
    }

    public FarTailCounts Counts => new(low, high, _sums[0].Value, _sums[1].Value, _sums[2].Value, _sums[3].Value, _sums[4].Value, _sums[5].Value);
}
