using GateTasks.Engine.Samples;

namespace GateTasks.Engine.References;

/// <summary>
/// Each joint feature's smallest and largest value over the reference rows whose joint features are all finite — the
/// rows a sliced projection takes — for the box <see cref="SlicedGridBuilder"/> spans its grids over.
/// </summary>
internal sealed class SlicedRange(IReadOnlyList<int> features)
{
    private readonly int[] _features = features.ToArray();

    public double[] Minimum { get; } = Enumerable.Repeat(double.PositiveInfinity, features.Count).ToArray();

    public double[] Maximum { get; } = Enumerable.Repeat(double.NegativeInfinity, features.Count).ToArray();

    /// <summary>Takes one batch's rows (after the selection).</summary>
    public void Add(FeatureView view)
    {
        for (var r = 0; r < view.Rows; r++)
        {
            var finite = true;
            for (var j = 0; j < _features.Length && finite; j++) finite = double.IsFinite(view.Feature(_features[j])[r]);
            if (!finite) continue;
            for (var j = 0; j < _features.Length; j++)
            {
                var x = view.Feature(_features[j])[r];
                if (x < Minimum[j]) Minimum[j] = x;
                if (x > Maximum[j]) Maximum[j] = x;
            }
        }
    }
}
