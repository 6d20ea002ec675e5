using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.References;

/// <summary>Streams one feature's finite values into weighted moments, minimum and maximum; NaN values are only counted.</summary>
internal sealed class FeatureStatistics
{
    private readonly WeightedMoments _moments = new();

    public double Min { get; private set; } = double.PositiveInfinity;
    public double Max { get; private set; } = double.NegativeInfinity;
    public long NanCount { get; private set; }
    public long Count => _moments.Count;

    public void Add(ReadOnlySpan<double> values, ReadOnlySpan<double> weights)
    {
        for (var r = 0; r < values.Length; r++)
        {
            var x = values[r];
            if (double.IsNaN(x)) { NanCount++; continue; }
            _moments.Add(x, weights.IsEmpty ? 1.0 : weights[r]);
            if (x < Min) Min = x;
            if (x > Max) Max = x;
        }
    }

    public FeatureSummary Summary() =>
        new(_moments.Count, _moments.SumOfWeights, _moments.SumOfSquaredWeights, _moments.Mean, _moments.StandardDeviation, Min, Max, NanCount);
}
