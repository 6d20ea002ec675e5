using GateTasks.Engine.Accumulation;
using GateTasks.Engine.References;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>Hands rows held column by column to the sliced counter and grid builder as one stream batch would.</summary>
internal static class SlicedRows
{
    /// <summary>A batch view of the columns (all of the same length) and the weights (empty for unit weights).</summary>
    public static FeatureView View(double[][] columns, double[] weights) =>
        new(columns, weights.Length == 0 ? new double[columns[0].Length] : weights, weighted: weights.Length > 0, new long[columns[0].Length]) { Rows = columns[0].Length };

    public static void Add(this SlicedHistogramCounter counter, double[][] columns, double[] weights) =>
        counter.Add(View(columns, weights), Enumerable.Range(0, columns.Length).ToArray());

    public static void Add(this SlicedGridBuilder builder, double[][] columns, double[] weights) =>
        builder.Add(View(columns, weights), Enumerable.Range(0, columns.Length).ToArray());
}
