using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Drafting;

/// <summary>
/// Profiles every numeric column of a trusted sample in two streamed passes (memory does not grow with the sample):
/// the first gathers moments, whether values are whole, the distinct values while there are at most a cap (the
/// draft's largest number of categories), and heavy-hitter candidates; the second weighs the candidates exactly, for
/// columns with more distinct values than the cap.
/// </summary>
internal static class ColumnProfiler
{
    // Any value holding more than 1/(k+1) ≈ 1% of the events is a candidate.
    private const int HeavyHitterCounters = 99;

    private sealed class Column(string name, SampleValueType type)
    {
        public readonly string Name = name;
        public readonly SampleValueType Type = type;
        public readonly FeatureStatistics Statistics = new();
        public readonly HeavyHitters Hitters = new(HeavyHitterCounters);
        public Dictionary<double, double>? Distinct = [];
        public Dictionary<double, double>? CandidateWeights;
        public bool Integral = true;
    }

    /// <summary>
    /// The profiles of the sample's numeric columns other than the weight and those <paramref name="excluded"/> says to
    /// leave out, tracking up to <paramref name="distinctCap"/> distinct values per column.
    /// </summary>
    public static IReadOnlyList<ColumnProfile> Profile(Sample sample, string? weightColumn, Func<string, bool> excluded, int distinctCap,
        IProgress<ReadProgress>? progress, out long events)
    {
        var columns = sample.Columns.Where(c => c.Type != SampleValueType.Unsupported && c.Name != weightColumn && !excluded(c.Name))
            .Select(c => new Column(c.Name, c.Type)).ToList();
        var names = columns.Select(c => c.Name).ToList();
        if (weightColumn is not null) names.Add(weightColumn);

        events = 0;
        var unit = Array.Empty<double>();
        foreach (var batch in sample.ReadBatches(names, new ReadPass("draft pass 1 (moments, categories, frequent values)", progress)))
        {
            var weightArray = Weights(batch, columns.Count, weightColumn, ref unit, sample.CurrentFile);
            events += batch.RowCount;
            Parallel.For(0, columns.Count, i =>
            {
                var c = columns[i];
                var values = batch.Column(i);
                var weights = weightArray.AsSpan(0, batch.RowCount);
                c.Statistics.Add(values, weightColumn is null ? default : weights); // empty: the unit-weight path
                for (var r = 0; r < values.Length; r++)
                {
                    var v = values[r];
                    if (!double.IsFinite(v)) continue;
                    if (c.Integral && (v != Math.Floor(v) || Math.Abs(v) > 9.007199254740992E15)) c.Integral = false;
                    c.Hitters.Add(v);
                    if (c.Distinct is null) continue;
                    c.Distinct[v] = c.Distinct.GetValueOrDefault(v) + weights[r];
                    if (c.Distinct.Count > distinctCap) c.Distinct = null;
                }
            });
        }

        // Pass 2 only where pass 1 lost count: columns with many distinct values and frequent-value candidates.
        var recount = columns.Where(c => c.Distinct is null && c.Hitters.Candidates.Count > 0).ToList();
        foreach (var c in recount) c.CandidateWeights = c.Hitters.Candidates.ToDictionary(v => v, _ => 0.0);
        if (recount.Count > 0)
        {
            var recountNames = recount.Select(c => c.Name).ToList();
            if (weightColumn is not null) recountNames.Add(weightColumn);
            foreach (var batch in sample.ReadBatches(recountNames, new ReadPass("draft pass 2 (frequent values weighed)", progress)))
            {
                var weightArray = Weights(batch, recount.Count, weightColumn, ref unit, sample.CurrentFile);
                Parallel.For(0, recount.Count, i =>
                {
                    var counts = recount[i].CandidateWeights!;
                    var values = batch.Column(i);
                    var weights = weightArray.AsSpan(0, batch.RowCount);
                    for (var r = 0; r < values.Length; r++)
                        if (counts.TryGetValue(values[r], out var w)) counts[values[r]] = w + weights[r];
                });
            }
        }

        return columns.Select(c =>
        {
            var summary = c.Statistics.Summary();
            var weighed = c.Distinct ?? c.CandidateWeights ?? [];
            var top = weighed.Count == 0 ? (KeyValuePair<double, double>?)null : weighed.MaxBy(p => p.Value);
            var share = top is { } t && summary.SumW > 0 ? t.Value / summary.SumW : 0;
            return new ColumnProfile(c.Name, c.Type, summary, c.Integral && summary.Count > 0, c.Distinct, top?.Key, share);
        }).ToList();
    }

    // The batch's weights (the last column when there is one), refused when not finite; unit weights otherwise.
    private static double[] Weights(SampleBatch batch, int weightIndex, string? weightColumn, ref double[] unit, string? file)
    {
        if (weightColumn is null)
        {
            if (unit.Length < batch.RowCount)
            {
                unit = new double[batch.RowCount];
                Array.Fill(unit, 1.0);
            }
            return unit;
        }
        var weights = batch.ColumnBuffer(weightIndex);
        for (var r = 0; r < batch.RowCount; r++)
        {
            var w = weights[r];
            if (double.IsFinite(w)) continue;
            throw SampleStream.BadWeight(file ?? "", batch, weightColumn, weightIndex, r, -1, w, "a trusted sample needs finite weights");
        }
        return weights;
    }
}
