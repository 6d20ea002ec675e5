using System.Numerics;
using System.Runtime.CompilerServices;

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

    // The thresholds as floats that sort float values as the doubles do: for a float x, x < low exactly when x is below
    // the smallest float not below low, and x > high exactly when x is above the largest float not above high.
    private readonly float _lowF = SmallestFloatNotBelow(low), _highF = LargestFloatNotAbove(high);

    /// <summary>
    /// Unit weights, the values stored as float32: the same six batch sums as <see cref="Add(ReadOnlySpan{double}, ReadOnlySpan{double})"/>
    /// with the values widened (each is a count of ones, exact in a double), counted a register at a time against the
    /// thresholds rounded to floats, so the values never leave the float path.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Add(ReadOnlySpan<float> values)
    {
        var lanes = Vector<float>.Count;
        var vLow = new Vector<float>(_lowF);
        var vHigh = new Vector<float>(_highF);
        // Lane counts as negated masks (a true compare is all ones, −1 as an integer); a batch is far below 2^31 values.
        Vector<int> vNumber = default, vBelow = default, vAbove = default;
        var i = 0;
        for (; i + lanes <= values.Length; i += lanes)
        {
            var v = new Vector<float>(values.Slice(i, lanes));
            var below = Vector.LessThan(v, vLow);
            vNumber += Vector.Equals(v, v);
            vBelow += below;
            vAbove += Vector.AndNot(Vector.GreaterThan(v, vHigh), below);
        }
        long number = -Vector.Sum(vNumber), belowCount = -Vector.Sum(vBelow), aboveCount = -Vector.Sum(vAbove);
        for (; i < values.Length; i++)
        {
            var x = values[i];
            if (float.IsNaN(x)) continue;
            number++;
            if (x < _lowF) belowCount++;
            else if (x > _highF) aboveCount++;
        }
        double[] batch = [belowCount, belowCount, aboveCount, aboveCount, number, number];
        for (var k = 0; k < batch.Length; k++) _sums[k].Add(batch[k]);
    }

    private static float SmallestFloatNotBelow(double value)
    {
        var f = (float)value;
        return f < value ? MathF.BitIncrement(f) : f;
    }

    private static float LargestFloatNotAbove(double value)
    {
        var f = (float)value;
        return f > value ? MathF.BitDecrement(f) : f;
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
