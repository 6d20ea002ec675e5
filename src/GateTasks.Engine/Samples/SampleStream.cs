using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>Receives one feature's values of one batch, with the batch's weights (empty: unit weights).</summary>
internal delegate void FeatureBatch(int feature, ReadOnlySpan<double> values, ReadOnlySpan<double> weights);

/// <summary>Receives a whole batch after its features were visited: <c>batch.Column(columnOfFeature[i])</c> holds feature i's values.</summary>
internal delegate void WholeBatch(SampleBatch batch, IReadOnlyList<int> columnOfFeature, ReadOnlySpan<double> weights);

/// <summary>Event totals of one pass over a sample.</summary>
internal readonly record struct SampleTotals(long Events, double SumW, double SumW2);

/// <summary>
/// One streamed pass over a sample for a list of feature columns and an optional weight column: reads each
/// column once per batch however many features share it, rejects non-finite weights, and counts events.
/// </summary>
internal static class SampleStream
{
    public static SampleTotals Run(Sample sample, IReadOnlyList<string> featureColumns, string? weightColumn, FeatureBatch visit, WholeBatch? afterEachBatch = null)
    {
        var columns = featureColumns.Distinct(StringComparer.Ordinal).ToList();
        var columnOf = featureColumns.Select(c => columns.IndexOf(c)).ToArray();
        var weightIndex = -1;
        if (weightColumn is not null)
        {
            weightIndex = columns.IndexOf(weightColumn);
            if (weightIndex < 0) { columns.Add(weightColumn); weightIndex = columns.Count - 1; }
        }

        long events = 0;
        double sumW = 0, sumW2 = 0;
        foreach (var batch in sample.ReadBatches(columns))
        {
            var weights = weightIndex >= 0 ? batch.Column(weightIndex) : ReadOnlySpan<double>.Empty;
            if (weights.IsEmpty)
            {
                sumW += batch.RowCount;
                sumW2 += batch.RowCount;
            }
            for (var r = 0; r < weights.Length; r++)
            {
                var w = weights[r];
                if (!double.IsFinite(w))
                    throw new GateInputException(ErrorCodes.SampleBadWeight,
                        $"Weight column '{weightColumn}' holds {InvariantNumber.Short(w)} at event {events + r} of the sample; weights must be finite.",
                        new SourceLocation(sample.CurrentFile ?? sample.Files[0]));
                sumW += w;
                sumW2 += w * w;
            }
            events += batch.RowCount;
            for (var i = 0; i < columnOf.Length; i++) visit(i, batch.Column(columnOf[i]), weights);
            afterEachBatch?.Invoke(batch, columnOf, weights);
        }
        return new SampleTotals(events, sumW, sumW2);
    }
}
