using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>Receives one feature's values of one batch, with the batch's weights (empty: unit weights).</summary>
internal delegate void FeatureBatch(int feature, ReadOnlySpan<double> values, ReadOnlySpan<double> weights);

/// <summary>Event totals of one pass over a sample (events that passed the selection); Σw and Σw² as exact sums, for merging with other shards.</summary>
internal sealed record SampleTotals(long Events, Statistics.ExactSum ExactSumW, Statistics.ExactSum ExactSumW2)
{
    public double SumW => ExactSumW.Value;
    public double SumW2 => ExactSumW2.Value;
}

/// <summary>
/// One streamed pass over a sample: reads each needed column once per batch, evaluates derived features
/// column-wise, applies the selection, rejects non-finite weights, and hands
/// every feature's values to the visitor, then the whole batch to the batch visitor. Buffers are reused across batches, so memory is bounded by the batch size.
/// </summary>
internal static class SampleStream
{
    /// <summary>Batches with at least this many rows visit their features in parallel.</summary>
    private const int ParallelBatchRows = 8192;

    /// <summary>A condition holds when it is non-zero and not NaN.</summary>
    private static bool Passes(double condition) => condition != 0 && !double.IsNaN(condition);

    public static SampleTotals Run(Sample sample, FeatureInputs inputs, string? weightColumn, FeatureBatch visit, Action<FeatureView>? afterEachBatch = null)
    {
        var columns = inputs.RequiredColumns.ToList();
        if (weightColumn is not null && !columns.Contains(weightColumn)) columns.Add(weightColumn);
        var index = columns.Select((c, i) => (c, i)).ToDictionary(p => p.c, p => p.i, StringComparer.Ordinal);
        var weightIndex = weightColumn is null ? -1 : index[weightColumn];
        var n = inputs.Count;

        var derived = new double[n][];
        var selected = new double[n][];
        var view = new double[n][];
        var weightBuffer = Array.Empty<double>();
        var mask = Array.Empty<double>();
        var frame = new FeatureView(view, weightBuffer, weightColumn is not null);
        var expressionInputs = inputs.Expressions.Select(e => e is null ? null : new double[e.Columns.Count][]).ToArray();
        var ownMask = new double[]?[n];
        var ownValues = new double[]?[n];
        var ownWeights = new double[]?[n];
        var ownRows = new int[n];

        long events = 0, read = 0;
        var largestWeight = 0.0;
        // Per batch in doubles, then exactly: totals that do not depend on how batches are grouped.
        var sumW = new Statistics.ExactSum();
        var sumW2 = new Statistics.ExactSum();
        foreach (var batch in sample.ReadBatches(columns))
        {
            var rows = batch.RowCount;
            if (mask.Length < rows)
            {
                mask = new double[rows];
                weightBuffer = new double[rows];
                // Only what is used: a derived buffer per expression, a selected one per feature when there is a selection.
                for (var i = 0; i < n; i++)
                {
                    derived[i] = inputs.Expressions[i] is null ? [] : new double[rows];
                    selected[i] = inputs.Selection is null ? [] : new double[rows];
                }
                frame = new FeatureView(view, weightBuffer, weightColumn is not null);
            }
            var rawWeights = weightIndex >= 0 ? batch.Column(weightIndex) : ReadOnlySpan<double>.Empty;
            for (var r = 0; r < rawWeights.Length; r++)
            {
                var w = rawWeights[r];
                if (!double.IsFinite(w))
                    throw BadWeight(sample.CurrentFile ?? sample.Files[0], batch, weightColumn!, weightIndex, r, read + r, w, "every event needs a finite weight");
                largestWeight = Math.Max(largestWeight, Math.Abs(w));
            }
            read += rows;

            // Derive: a column is used in place, an expression is evaluated over the whole batch.
            for (var i = 0; i < n; i++)
            {
                if (inputs.Expressions[i] is { } e)
                {
                    var args = expressionInputs[i]!;
                    for (var a = 0; a < args.Length; a++) args[a] = batch.ColumnBuffer(index[e.Columns[a]]);
                    e.Evaluate(args, rows, derived[i].AsSpan(0, rows));
                    view[i] = derived[i];
                }
                else view[i] = batch.ColumnBuffer(index[inputs.FeatureColumns[i]!]);
            }
            if (weightIndex >= 0) rawWeights.CopyTo(weightBuffer);

            // Select: keep the rows whose condition is true (NaN counts as false), compacted into the same view.
            var kept = rows;
            if (inputs.Selection is { } selection)
            {
                var selectionArgs = selection.Columns.Select(c => batch.ColumnBuffer(index[c])).ToArray();
                selection.Evaluate(selectionArgs, rows, mask.AsSpan(0, rows));
            }
            else mask.AsSpan(0, rows).Fill(1);

            // A feature with a condition of its own (a category) keeps the rows that pass both; it is compacted on its own.
            for (var i = 0; i < n; i++)
            {
                if (inputs.Conditions[i] is not { } condition) continue;
                ownMask[i] ??= new double[mask.Length];
                if (ownMask[i]!.Length < rows) ownMask[i] = new double[rows];
                ownValues[i] ??= new double[mask.Length];
                if (ownValues[i]!.Length < rows) { ownValues[i] = new double[rows]; ownWeights[i] = new double[rows]; }
                ownWeights[i] ??= new double[ownValues[i]!.Length];
                var conditionArgs = condition.Columns.Select(c => batch.ColumnBuffer(index[c])).ToArray();
                condition.Evaluate(conditionArgs, rows, ownMask[i].AsSpan(0, rows));
                var k = 0;
                for (var r = 0; r < rows; r++)
                {
                    if (!Passes(mask[r]) || !Passes(ownMask[i]![r])) continue;
                    ownValues[i]![k] = view[i][r];
                    ownWeights[i]![k] = weightIndex >= 0 ? weightBuffer[r] : 1;
                    k++;
                }
                ownRows[i] = k;
            }

            if (inputs.Selection is not null)
            {
                kept = 0;
                for (var r = 0; r < rows; r++)
                {
                    if (!Passes(mask[r])) continue;
                    for (var i = 0; i < n; i++) selected[i][kept] = view[i][r];
                    weightBuffer[kept] = weightIndex >= 0 ? weightBuffer[r] : 1;
                    kept++;
                }
                for (var i = 0; i < n; i++) view[i] = selected[i];
            }
            frame.Rows = kept;

            var weights = frame.Weights;
            double batchW = weights.IsEmpty ? kept : 0, batchW2 = weights.IsEmpty ? kept : 0;
            foreach (var w in weights)
            {
                batchW += w;
                batchW2 += w * w;
            }
            sumW.Add(batchW);
            sumW2.Add(batchW2);
            events += kept;
            // Features are independent from here on (each touches only its visitor's state for that feature), so large
            // batches spread them over the cores; the results do not depend on it.
            void Visit(int i)
            {
                var values = inputs.Conditions[i] is null ? frame.Feature(i) : ownValues[i].AsSpan(0, ownRows[i]);
                var featureWeights = inputs.Conditions[i] is null ? frame.Weights
                    : weightIndex >= 0 ? ownWeights[i].AsSpan(0, ownRows[i]) : ReadOnlySpan<double>.Empty;
                visit(i, values, featureWeights);
            }
            if (n > 1 && kept >= ParallelBatchRows && sample.Parallelism > 1)
                Parallel.For(0, n, new ParallelOptions { MaxDegreeOfParallelism = sample.Parallelism }, Visit);
            else for (var i = 0; i < n; i++) Visit(i);
            afterEachBatch?.Invoke(frame);
        }
        if (weightColumn is not null)
            SampleWeights.RequireRepresentableSquares(largestWeight, weightColumn, sample.Files, new SourceLocation(sample.Files[0]));
        return new SampleTotals(events, sumW, sumW2);
    }

    /// <summary>
    /// GATE2007 for a weight that is not finite, at its cell where the reader can say (a CSV line and column, a Parquet
    /// row) and in the file's own words (an empty cell or a null is a missing weight, not a NaN);
    /// <paramref name="eventIndex"/> -1: unknown.
    /// </summary>
    internal static GateInputException BadWeight(string file, SampleBatch batch, string weightColumn, int weightIndex, int row, long eventIndex,
        double value, string need)
    {
        if (batch.Locate?.Invoke(row, weightIndex) is { } origin)
            return new GateInputException(ErrorCodes.SampleBadWeight,
                $"weight column '{weightColumn}' holds {origin.Written} at {origin.Place} of sample file '{file}'; {need}",
                origin.Location);
        return new GateInputException(ErrorCodes.SampleBadWeight,
            $"weight column '{weightColumn}' holds {InvariantNumber.Short(value)} " +
            (eventIndex >= 0 ? $"at event {eventIndex + 1} of the sample (in file '{file}'); {need}" : $"in sample file '{file}'; {need}"),
            new SourceLocation(file));
    }
}
