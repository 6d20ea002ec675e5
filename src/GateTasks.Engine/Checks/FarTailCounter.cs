using GateTasks.Engine.References;

namespace GateTasks.Engine.Checks;

/// <summary>Counts, while streaming, the weight strictly below <paramref name="low"/> and strictly above <paramref name="high"/>.</summary>
internal sealed class FarTailCounter(double low, double high)
{
    private double _belowW, _belowW2, _aboveW, _aboveW2, _totalW, _totalW2;

    public void Add(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        for (var i = 0; i < values.Length; i++)
        {
            var x = values[i];
            if (double.IsNaN(x)) continue;
            var w = weights.IsEmpty ? 1.0 : weights[i];
            _totalW += w;
            _totalW2 += w * w;
            if (x < low) { _belowW += w; _belowW2 += w * w; }
            else if (x > high) { _aboveW += w; _aboveW2 += w * w; }
        }
    }

    public FarTailCounts Counts => new(low, high, _belowW, _belowW2, _aboveW, _aboveW2, _totalW, _totalW2);

    /// <summary>The thresholds every far-tail count uses: the reference's 0.1% and 99.9% quantiles.</summary>
    public static (double Low, double High)? Thresholds(ReferenceFeature reference) =>
        reference.Quantile(0.001) is { } lo && reference.Quantile(0.999) is { } hi ? (lo, hi) : null;
}
