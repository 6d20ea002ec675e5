using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.IO;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.References;

/// <summary>
/// Builds a reference from a trusted sample in two streamed passes: the first finds each feature's range and
/// moments, the second fills a fine quantile grid (and the final histogram where its edges are already known).
/// Memory depends on the number of features and bins, never on the number of events.
/// </summary>
internal static class ReferenceBuilder
{
    /// <summary>Most categories a discrete feature may have.</summary>
    public const int MaxCategories = 10_000;

    /// <summary>Probabilities whose quantiles every reference stores (besides those the contract's cores need).</summary>
    public static readonly double[] StandardProbabilities =
        [0.001, 0.01, 0.025, 0.05, 0.1, 0.16, 0.25, 0.5, 0.75, 0.84, 0.9, 0.95, 0.975, 0.99, 0.999];

    /// <summary>Builds the reference for <paramref name="contract"/>'s features from <paramref name="files"/>.</summary>
    public static ReferenceHistograms Build(PrecisionContract contract, IReadOnlyList<string> files, string? weightColumn, string toolVersion)
    {
        var features = contract.Features;
        var sample = Sample.Open(files);
        var columns = features.Select(f => f.Column).Distinct(StringComparer.Ordinal).ToList();
        var columnOf = features.Select(f => columns.IndexOf(f.Column)).ToArray();
        var weightIndex = -1;
        if (weightColumn is not null)
        {
            weightIndex = columns.IndexOf(weightColumn);
            if (weightIndex < 0) { columns.Add(weightColumn); weightIndex = columns.Count - 1; }
        }

        // Pass 1: ranges and moments.
        var n = features.Count;
        var moments = new WeightedMoments[n];
        for (var i = 0; i < n; i++) moments[i] = new WeightedMoments();
        var min = Enumerable.Repeat(double.PositiveInfinity, n).ToArray();
        var max = Enumerable.Repeat(double.NegativeInfinity, n).ToArray();
        var nan = new long[n];
        long events = 0;
        double sumW = 0, sumW2 = 0;
        foreach (var batch in sample.ReadBatches(columns))
        {
            var weights = weightIndex >= 0 ? batch.Column(weightIndex) : ReadOnlySpan<double>.Empty;
            EventWeights.Validate(weights, weightColumn, sample, events);
            for (var r = 0; r < batch.RowCount; r++)
            {
                var w = weights.IsEmpty ? 1.0 : weights[r];
                sumW += w;
                sumW2 += w * w;
            }
            events += batch.RowCount;
            for (var i = 0; i < n; i++)
            {
                var values = batch.Column(columnOf[i]);
                for (var r = 0; r < values.Length; r++)
                {
                    var x = values[r];
                    if (double.IsNaN(x)) { nan[i]++; continue; }
                    moments[i].Add(x, weights.IsEmpty ? 1.0 : weights[r]);
                    if (x < min[i]) min[i] = x;
                    if (x > max[i]) max[i] = x;
                }
            }
        }
        if (events == 0)
            throw new GateInputException(ErrorCodes.SampleEmpty, $"The reference sample has no events ({string.Join(", ", files)}).",
                new SourceLocation(files[0]));
        for (var i = 0; i < n; i++)
        {
            if (moments[i].Count == 0)
                throw new GateInputException(ErrorCodes.SampleEmpty,
                    $"Feature '{features[i].Name}' (column '{features[i].Column}') has no finite value in the reference sample.", features[i].ColumnLocation);
            if (double.IsInfinity(min[i]) || double.IsInfinity(max[i]))
                throw new GateInputException(ErrorCodes.SampleColumnType,
                    $"Feature '{features[i].Name}' (column '{features[i].Column}') holds infinite values in the reference sample; a reference must be finite.",
                    features[i].ColumnLocation);
        }

        // Pass 2: fine quantile grids and directly binned histograms.
        var grids = new QuantileGrid?[n];
        var direct = new Histogram?[n];
        for (var i = 0; i < n; i++)
        {
            var f = features[i];
            if (f.Kind == FeatureKind.Continuous) grids[i] = new QuantileGrid(min[i], max[i]);
            direct[i] = f.Binning.Mode switch
            {
                BinningMode.Uniform => new Histogram(new RegularAxis(f.Binning.Bins, f.Binning.Lower, f.Binning.Upper)),
                BinningMode.Edges => new Histogram(Axis.FromEdges(f.Binning.Edges)),
                BinningMode.Categories => new Histogram(CategoryAxis(f, min[i], max[i])),
                _ => null,
            };
        }
        foreach (var batch in sample.ReadBatches(columns))
        {
            var weights = weightIndex >= 0 ? batch.Column(weightIndex) : ReadOnlySpan<double>.Empty;
            for (var i = 0; i < n; i++)
            {
                var values = batch.Column(columnOf[i]);
                grids[i]?.Fine.Fill(values, weights);
                direct[i]?.Fill(values, weights);
            }
        }

        var result = new List<ReferenceFeature>();
        for (var i = 0; i < n; i++)
        {
            var f = features[i];
            var grid = grids[i];
            var histogram = direct[i]
                ?? grid!.Rebin(new VariableAxis(grid.EqualProbabilityEdges(f.Binning.Bins)), events);
            var probabilities = StandardProbabilities.Concat([f.Core.LowerQuantile, f.Core.UpperQuantile])
                .Distinct().Order().ToList();
            var quantiles = grid is null
                ? new List<QuantilePoint>()
                : probabilities.Select(p => new QuantilePoint(p, grid.Quantile(p))).ToList();
            var m = moments[i];
            var summary = new FeatureSummary(m.Count, m.SumOfWeights, m.SumOfSquaredWeights, m.Mean, m.StandardDeviation, min[i], max[i], nan[i]);
            result.Add(new ReferenceFeature(f.Name, f.Column, f.Kind, f.Binning.Canonical, histogram, summary, quantiles));
        }

        var inputs = files.Select(p => new ReferenceInput(Path.GetFileName(p), new FileInfo(p).Length, FileDigest.Sha256(p))).ToList();
        return new ReferenceHistograms(ReferenceFile.FormatVersion, DateTimeOffset.UtcNow, toolVersion, inputs,
            weightColumn, events, sumW, sumW2, result);
    }

    private static Axis CategoryAxis(FeatureSpec f, double min, double max)
    {
        var lo = Math.Floor(min);
        var hi = Math.Ceiling(max);
        var count = hi - lo + 1;
        if (count > MaxCategories)
            throw new GateInputException(ErrorCodes.ContractBadValue,
                $"Feature '{f.Name}' is declared discrete but spans {count:0} values ({min} to {max}); at most {MaxCategories} categories are allowed. Declare it continuous.",
                f.Location);
        // One unit-wide bin centred on each integer value.
        return new RegularAxis((int)count, lo - 0.5, hi + 0.5);
    }
}
