using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.IO;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.References;

/// <summary>
/// Builds a reference from a trusted sample in two streamed passes: the first finds each feature's range and
/// moments, the second fills a fine quantile grid (and the final histogram where its edges are already known).
/// Memory depends on the number of features and bins, never on the number of events.
/// </summary>
internal static class ReferenceBuilder
{
    /// <summary>
    /// Equal-probability bins of the fine grid kept for a feature with a Wasserstein or quantile check, and the dyadic levels
    /// added in each tail beyond them (<see cref="QuantileGrid.FineEdges"/>): enough that W1 from the grid agrees with
    /// the unbinned value within a few percent on long-tailed features, at about 100–200 kB of reference header per such feature.
    /// </summary>
    public const int FineGridBins = 4096, FineGridTailLevels = 4;

    /// <summary>Most categories a discrete feature may have.</summary>
    public const int MaxCategories = 10_000;

    /// <summary>Probabilities whose quantiles every reference stores (besides those the contract's cores need).</summary>
    public static readonly double[] StandardProbabilities =
        [0.001, 0.01, 0.025, 0.05, 0.1, 0.16, 0.25, 0.5, 0.75, 0.84, 0.9, 0.95, 0.975, 0.99, 0.999];

    /// <summary>Builds the reference for <paramref name="contract"/>'s features from <paramref name="files"/>.</summary>
    public static ReferenceHistograms Build(PrecisionContract contract, IReadOnlyList<string> files, string? weightColumn, string toolVersion,
        IProgress<ReadProgress>? progress = null)
    {
        var features = contract.Features;
        var sample = Sample.Open(files);
        var pass = new ReadPass("reference pass 1 (ranges and moments)", progress);
        VerifyColumns(contract, sample, weightColumn);
        var columns = FeatureSources.Compile(contract, sample.ColumnNamesInAnyFile);
        var n = features.Count;

        // Pass 1: ranges and moments.
        var stats = features.Select(_ => new FeatureStatistics()).ToArray();
        var jointIndex = contract.Joint?.Features.Select(name => features.ToList().FindIndex(f => f.Name == name)).ToArray();
        // Every joint block standardises by the reference's own means and spreads over its joint rows (its checks and
        // the global score read them): found in this pass (raw units), applied in the next.
        var jointScale = contract.Joint is not null ? new JointMoments(jointIndex!, JointStandardisation.Identity(jointIndex!.Length), true, false) : null;
        // Each pass puts the declared spikes apart; the first one's tallies are the reference's.
        var spikes = new SpikeSeparation(features);
        // The sliced grids span the box of the joint features' ranges over the rows the projections take (all finite).
        var slicedRange = contract.Joint is { Slices: true } ? new SlicedRange(jointIndex!) : null;
        var totals = SampleStream.Run(sample, columns, weightColumn, spikes.Around((i, values, weights) => stats[i].Add(values, weights)),
            BatchVisits(jointScale is null ? null : jointScale.Add, slicedRange is null ? null : slicedRange.Add), pass);
        if (totals.Events == 0 && contract.Selection is { } selection && sample.RowsRead > 0)
            throw new GateInputException(ErrorCodes.SampleEmpty,
                $"The selection '{selection.Text}' keeps none of the {InvariantNumber.Count(sample.RowsRead)} events of the reference sample " +
                $"({string.Join(", ", files.Select(Path.GetFileName))}); a reference needs events to compare with.", selection.Location);
        if (totals.Events == 0)
            throw new GateInputException(ErrorCodes.SampleEmpty, $"The reference sample has no events ({string.Join(", ", files)}).",
                new SourceLocation(files[0]));
        if (weightColumn is not null)
            SampleWeights.RequireNormalisable(totals.SumW, totals.SumW2, totals.Events, weightColumn, "reference sample", files, new SourceLocation(files[0]));
        var min = stats.Select(s => s.Min).ToArray();
        var max = stats.Select(s => s.Max).ToArray();
        for (var i = 0; i < n; i++)
        {
            if (stats[i].Count == 0)
                throw new GateInputException(ErrorCodes.SampleEmpty,
                    $"Feature '{features[i].Name}' (column '{features[i].Column}') has no finite value{(features[i].Spike is null ? "" : " besides its spike")} in the reference sample.", features[i].ColumnLocation);
            if (!double.IsFinite(max[i] - min[i]))
                throw new GateInputException(ErrorCodes.SampleColumnType,
                    $"Feature '{features[i].Name}' (column '{features[i].Column}') spans from {InvariantNumber.Short(min[i])} to {InvariantNumber.Short(max[i])} in the reference sample, " +
                    "a range wider than a double can hold; rescale it (other units) before building a reference.", features[i].ColumnLocation);
            var moments = stats[i].Summary();
            if (!double.IsFinite(moments.Mean) || !double.IsFinite(moments.StandardDeviation))
                throw new GateInputException(ErrorCodes.SampleColumnType,
                    $"Feature '{features[i].Name}' (column '{features[i].Column}') reaches {InvariantNumber.Short(Math.Max(Math.Abs(min[i]), Math.Abs(max[i])))} in the reference sample: " +
                    "its mean or spread (sums of squares) overflows a double; rescale it (other units) before building a reference.", features[i].ColumnLocation);
            NonFiniteValues(features[i], stats[i], totals.Events);
            if (stats[i].PositiveInfinityCount + stats[i].NegativeInfinityCount > 0)
                throw new GateInputException(ErrorCodes.SampleColumnType,
                    $"Feature '{features[i].Name}' (column '{features[i].Column}') holds infinite values in the reference sample; a reference must be finite.",
                    features[i].ColumnLocation);
            // Binning, quantiles and width checks all need spread; a constant is a spike or a category, said so.
            if (features[i].Kind == FeatureKind.Continuous && min[i] == max[i])
                throw new GateInputException(ErrorCodes.ReferenceNoSpread,
                    $"Feature '{features[i].Name}' (column '{features[i].Column}') takes the single value {InvariantNumber.Short(min[i])} in all {InvariantNumber.Count(stats[i].Count)} events of the reference sample" +
                    $"{(features[i].Spike is null ? "" : " besides its spike")}: a continuous feature needs spread to be binned and compared. " +
                    "Declare it 'kind: discrete' (its category fractions are then checked) or drop it.",
                    features[i].Location);
        }

        // The covariance moments are kept for every joint block: they give the run's global score (the Fréchet distance)
        // even without a frechet-max check.
        var jointStandardisation = jointScale is null ? null : JointScale(contract.Joint!, jointScale);
        var jointMoments = jointStandardisation is null ? null
            : new JointMoments(jointIndex!, jointStandardisation, true, contract.Joint!.KernelDistance is not null);

        // The sliced checks' directions, drawn from the feature names, and the reference's standardisation: their grids are
        // found in pass 2, the reference's histograms on them filled in pass 3.
        var slicedProjection = slicedRange is null ? null
            : new Statistics.SlicedProjection(Statistics.SlicedDirections.Draw(contract.Joint!.Features, contract.Joint.Projections),
                jointStandardisation!.Means, jointStandardisation.StandardDeviations);
        var slicedGrids = slicedProjection is null ? null : new SlicedGridBuilder(slicedProjection, slicedRange!.Minimum, slicedRange.Maximum);

        // Pass 2: fine quantile grids and directly binned histograms (and the joint block's streamed moments).
        var grids = new QuantileGrid?[n];
        var direct = new Histogram?[n];
        for (var i = 0; i < n; i++)
        {
            var f = features[i];
            if (f.Kind == FeatureKind.Continuous) grids[i] = new QuantileGrid(min[i], max[i]);
            direct[i] = f.Binning switch
            {
                UniformBinning u => new Histogram(new RegularAxis(u.Bins, u.Lower, u.Upper)),
                EdgeBinning e => new Histogram(Axis.FromEdges(e.Edges)),
                CategoryBinning => new Histogram(CategoryAxis(f, min[i], max[i])),
                _ => null, // quantile bins: rebinned from the fine grid once the reference is read
            };
        }
        SampleStream.Run(sample, columns, weightColumn, new SpikeSeparation(features).Around((i, values, weights) =>
        {
            grids[i]?.Fine.Fill(values, weights);
            direct[i]?.Fill(values, weights);
        }), BatchVisits(jointMoments is null ? null : jointMoments.Add, slicedGrids is null ? null : view => slicedGrids.Add(view, jointIndex!)),
            pass.For("reference pass 2 (quantile grids)"));

        var result = new List<ReferenceFeature>();
        for (var i = 0; i < n; i++)
        {
            var f = features[i];
            var grid = grids[i];
            var histogram = f.Binning is QuantileBinning quantile
                ? grid!.Fine.Rebinned(new VariableAxis(grid.EqualProbabilityEdges(quantile.Bins)), totals.Events)
                : direct[i]!;
            var probabilities = StandardProbabilities.Concat([f.Core.LowerQuantile, f.Core.UpperQuantile])
                .Distinct().Order().ToList();
            var quantiles = grid is null
                ? new List<QuantilePoint>()
                : probabilities.Select(p => new QuantilePoint(p, grid.Quantile(p))).ToList();
            result.Add(new ReferenceFeature(f.Name, f.Column, f.Kind, f.ReferenceRequest, histogram, stats[i].Summary(), quantiles, spikes.Filters[i]?.Tally));
            BinCoverage.Verify(f, result[i]);
        }

        // Third pass, only when needed: Spearman's ranks need the final marginals, far-tail counts the final quantiles,
        // a Wasserstein check the reference's weight on its fine grid (counted like the sample's, tails included).
        var correlations = new List<ReferenceCorrelation>();
        var farTail = features.Select((f, i) => f.Checks.Any(c => c.Kind == CheckKind.FarTail) && result[i].FarTailThresholds is { } t
            ? new FarTailCounter(t.Low, t.High) : null).ToArray();
        var fine = features.Select((f, i) => f.NeedsFineGrid && grids[i] is { } g
            ? new FineGridCounter(g.FineEdges(FineGridBins, FineGridTailLevels)) : null).ToArray();
        var slicedEdges = slicedGrids?.Edges();
        var slicedCounter = slicedEdges is null ? null : new SlicedHistogramCounter(slicedProjection!, slicedEdges);
        if (contract.Pairs.Count > 0 || farTail.Any(t => t is not null) || fine.Any(g => g is not null) || slicedCounter is not null)
        {
            var index = features.Select((f, i) => (f.Name, i)).ToDictionary(p => p.Name, p => p.i);
            var pairSet = new PairAccumulation(contract.Pairs, index, i => result[i].Histogram);
            var pairs = pairSet.Pairs;
            SampleStream.Run(sample, columns, weightColumn, new SpikeSeparation(features).Around((i, values, weights) =>
            {
                farTail[i]?.Add(values, weights);
                fine[i]?.Add(values, weights);
            }), BatchVisits(pairs.Count == 0 ? null : view => pairSet.Add(view),
                slicedCounter is null ? null : view => slicedCounter.Add(view, jointIndex!)),
                pass.For("reference pass 3 (correlations, far tails, fine grids, sliced histograms)"));
            foreach (var p in pairs.Select(p => p.Finish()))
            {
                if (double.IsNaN(p.Pearson) || double.IsNaN(p.Spearman))
                    throw new GateInputException(ErrorCodes.ContractBadValue,
                        $"The correlation of {p.Spec.Name} is undefined in the reference sample: one of the two is constant (or all NaN).", p.Spec.Location);
                correlations.Add(new ReferenceCorrelation(p.Spec.First, p.Spec.Second, p.Pearson, p.Spearman, p.EffectiveCount,
                    p.PearsonVariance, p.SpearmanVariance, p.Cells?.SumW, p.Cells?.SumW2));
            }
            for (var i = 0; i < n; i++)
            {
                if (farTail[i] is { } counter) result[i] = result[i] with { FarTail = counter.Counts };
                if (fine[i] is { } grid) result[i] = result[i] with { FineGrid = grid.Finish() };
            }
        }

        var inputs = files.Select(p => new ReferenceInput(Path.GetFileName(p), new FileInfo(p).Length, FileDigest.Sha256(p))).ToList();
        return new ReferenceHistograms(ReferenceFile.FormatVersion, DateTimeOffset.UtcNow, toolVersion, inputs,
            weightColumn, totals.Events, totals.SumW, totals.SumW2, result, correlations,
            jointMoments is null ? null : new ReferenceJointMoments(contract.Joint!.Features, jointStandardisation!, jointMoments.State()),
            slicedCounter is null ? null : SlicedReference(contract.Joint!, slicedProjection!, slicedEdges!, jointStandardisation!, slicedCounter));
    }

    /// <summary>
    /// The sliced grid and the reference's histograms on it; a reference with no row the projections take, or whose
    /// projected spread is not positive, is refused (GATE2009), since W1 is given in units of that spread.
    /// </summary>
    private static ReferenceSliced SlicedReference(JointSpec spec, Statistics.SlicedProjection projection, double[][] edges,
        JointStandardisation standardisation, SlicedHistogramCounter counter)
    {
        var histograms = counter.Finish();
        for (var k = 0; k < histograms.Projections; k++)
            if (!(histograms.StandardDeviation[k] > 0) || !(histograms.TotalSumW(k) > 0))
                throw new GateInputException(ErrorCodes.ReferenceNoSpread,
                    $"Projection {k} of {spec.Name} has total weight {InvariantNumber.Short(histograms.TotalSumW(k))} and spread {InvariantNumber.Short(histograms.StandardDeviation[k])} " +
                    $"over the reference's {InvariantNumber.Count(histograms.Rows)} rows: its sliced checks need a positive total and spread along every direction.", spec.Location);
        var grid = new SlicedGrid(spec.Features, projection.Directions, standardisation.Means.ToArray(), standardisation.StandardDeviations.ToArray(), edges);
        return new ReferenceSliced(grid, histograms);
    }

    /// <summary>
    /// The joint features' weighted means and standard deviations over the reference rows where all are finite; a
    /// spread that is not positive (a feature constant over those rows, or weights that cancel) is refused (GATE2009),
    /// since the standardised distances would divide by it.
    /// </summary>
    private static JointStandardisation JointScale(JointSpec spec, JointMoments raw)
    {
        if (raw.Rows < 2)
            throw new GateInputException(ErrorCodes.ReferenceNoSpread,
                $"The reference sample has {raw.Rows} event{(raw.Rows == 1 ? "" : "s")} with every feature of {spec.Name} finite; its joint checks need rows to compare.", spec.Location);
        var (means, sds) = raw.MeanAndSpread();
        for (var k = 0; k < sds.Length; k++)
            if (!(sds[k] > 0) || !double.IsFinite(sds[k]) || !double.IsFinite(means[k]))
                throw new GateInputException(ErrorCodes.ReferenceNoSpread,
                    $"Feature '{spec.Features[k]}' of {spec.Name} has no positive spread over the reference's {InvariantNumber.Count(raw.Rows)} joint rows " +
                    $"(weighted standard deviation {InvariantNumber.Short(sds[k])}): the joint checks standardise by it. Drop it from the joint set.", spec.Location);
        return new JointStandardisation(means, sds);
    }

    /// <summary>
    /// Refuses NaN or ±∞ that a derived feature's expression makes in the reference (log(x) of a column that is
    /// sometimes negative, say) unless the contract allows non-finite values for it (GATE2106, at the expression, with
    /// the counts): a domain error, not a measurement. NaN read from a column are counted apart, as before; allowed NaN
    /// of an expression too; ±∞ are refused after this in any case.
    /// </summary>
    private static void NonFiniteValues(FeatureSpec f, FeatureStatistics s, long events)
    {
        if (f.Expression is not { } expression || f.AllowNonFinite || s.NanCount + s.PositiveInfinityCount + s.NegativeInfinityCount == 0) return;
        var counts = string.Join(", ", new[] { (s.NanCount, "NaN"), (s.PositiveInfinityCount, "+∞"), (s.NegativeInfinityCount, "−∞") }
            .Where(c => c.Item1 > 0).Select(c => $"{InvariantNumber.Count(c.Item1)} {c.Item2}"));
        throw new GateInputException(ErrorCodes.ReferenceNonFinite,
            $"The expression '{expression}' of feature '{f.Name}' gives {counts} among the {InvariantNumber.Count(events)} events of the reference sample. " +
            "Guard the expression (or select the events where it is defined), or declare 'non-finite: allow' for the feature to count NaN apart.",
            f.ColumnLocation);
    }

    /// <summary>
    /// Every column a feature or the contract's weight reads must be in the reference sample: said at the contract's line,
    /// with the column and the file (GATE1007), before anything is read.
    /// </summary>
    private static void VerifyColumns(PrecisionContract contract, Sample sample, string? weightColumn)
    {
        var available = sample.ColumnNamesInAnyFile;
        var where = sample.Files.Count == 1
            ? $"the reference sample {sample.Files[0]} does not have"
            : $"none of the reference sample's {sample.Files.Count} files ({string.Join(", ", sample.Files.Select(Path.GetFileName))}) has";
        foreach (var f in contract.Features)
        {
            if (f.Expression is not null || available.Contains(f.Column)) continue; // an expression's columns are checked when it is compiled
            throw new GateInputException(ErrorCodes.ContractUnknownColumn,
                $"Feature '{f.Name}' reads column '{f.Column}', which {where}{NearestName.Hint(f.Column, available)}.", f.ColumnLocation);
        }
        if (weightColumn is not null && !available.Contains(weightColumn) && weightColumn == contract.Sample.Weight)
            throw new GateInputException(ErrorCodes.ContractUnknownColumn,
                $"The contract weighs events by column '{weightColumn}', which {where}{NearestName.Hint(weightColumn, available)}.",
                contract.Sample.WeightLocation);
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

    // The batch visitors of a pass that are asked for; each keeps to its own state, so the stream may run them side by side.
    private static List<Action<FeatureView>> BatchVisits(params Action<FeatureView>?[] visits) =>
        visits.Where(v => v is not null).Select(v => v!).ToList();

}
