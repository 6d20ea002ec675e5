namespace GateTasks.Engine.Samples;

/// <summary>One batch's feature values after derivation and selection: what the histograms and statistics see.</summary>
internal sealed class FeatureView(double[][] features, double[] weights, bool weighted)
{
    public int Rows { get; internal set; }

    public ReadOnlySpan<double> Feature(int index) => features[index].AsSpan(0, Rows);

    /// <summary>The events' weights, empty for unit weights.</summary>
    public ReadOnlySpan<double> Weights => weighted ? weights.AsSpan(0, Rows) : ReadOnlySpan<double>.Empty;
}
