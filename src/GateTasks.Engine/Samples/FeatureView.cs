namespace GateTasks.Engine.Samples;

/// <summary>One batch's feature values after derivation and selection: what the histograms and statistics see.</summary>
internal sealed class FeatureView(double[][] features, double[] weights, bool weighted, long[] fileRows)
{
    /// <summary>Rows of the features that follow the common selection (all but those with a condition of their own).</summary>
    public int Rows { get; internal set; }

    /// <summary>A feature's values. Features with a condition of their own are not aligned with the others; use <see cref="SampleStream"/>'s visitor for them.</summary>
    public ReadOnlySpan<double> Feature(int index)
    {
        Prepare?.Invoke(index);
        return features[index].AsSpan(0, Rows);
    }

    /// <summary>Called with a feature's index before its values are read: fills a buffer whose conversion was put off.</summary>
    internal Action<int>? Prepare { get; init; }

    /// <summary>
    /// Each row's index within its file (0-based, counted before the selection): a place that does not depend on how
    /// files are grouped into shards, for assigning rows to blocks.
    /// </summary>
    public ReadOnlySpan<long> FileRows => fileRows.AsSpan(0, Rows);

    /// <summary>The events' weights, empty for unit weights.</summary>
    public ReadOnlySpan<double> Weights => weighted ? weights.AsSpan(0, Rows) : ReadOnlySpan<double>.Empty;
}
