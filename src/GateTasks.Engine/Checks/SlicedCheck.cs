using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// <c>sliced-ks-max</c> and <c>sliced-wasserstein-max</c>: the worst and the mean over K fixed directions of the
/// projected Kolmogorov–Smirnov and Wasserstein-1 distances (<see cref="SlicedDistance"/>; Rabin et al. 2011, Bonneel
/// et al. 2015, Deshpande et al. 2019) between the reference's and the sample's histograms of every event's
/// projections. One set of group-resampling replicates per block (<see cref="SlicedBootstrap"/>, Rao &amp; Wu 1988)
/// gives each summary's standard errors and bias; each tolerance adds its boundary replicas; the decision is that of
/// every distance (<see cref="DistanceDecision"/>). The floor — what the distance reads between two samples of the
/// reference's law at these sizes — is reported beside the estimate, since the bias removes only part of it.
/// </summary>
internal static class SlicedCheck
{
    /// <summary>Each of the block's sliced tolerances with its measurement, in the block's order.</summary>
    public static IReadOnlyList<(SlicedToleranceCheck Check, Measurement Measured)> Evaluate(JointSpec spec, SlicedHistograms reference, SlicedHistograms? sample,
        DecisionSettings decision, long sampleEvents)
    {
        if (sample is null)
            return spec.Sliced.Select(c => (c, Measurement.Impossible("no sliced histograms were gathered", []))).ToList();
        var details = new List<KeyValuePair<string, string>>
        {
            new("projections", InvariantNumber.Count(reference.Projections)), new("groups", InvariantNumber.Count(reference.Groups)),
            new("reference_rows", InvariantNumber.Count(reference.Rows)), new("sample_rows", InvariantNumber.Count(sample.Rows)),
            new("sample_rows_skipped", InvariantNumber.Count(sample.Skipped)),
        };
        SlicedBootstrap bootstrap;
        IReadOnlyList<SlicedReading> readings;
        try
        {
            bootstrap = new SlicedBootstrap(reference, sample, HistogramBootstrap.Seed(spec.Name, "sliced"));
            readings = bootstrap.Read();
        }
        catch (ArgumentException e)
        {
            // No rows, weights that cancel, another grid: nothing to measure, so undecided with the reason — never a pass.
            var reason = $"the sliced distances of {InvariantNumber.Count(reference.Rows)} reference and {InvariantNumber.Count(sample.Rows)} sample rows cannot be measured: {e.Message}";
            return spec.Sliced.Select(c => (c, Measurement.Impossible(reason, details))).ToList();
        }
        var result = new List<(SlicedToleranceCheck, Measurement)>();
        foreach (var check in spec.Sliced)
        {
            var measure = check.Kind == CheckKind.SlicedKolmogorovSmirnov ? SlicedMeasure.KolmogorovSmirnov : SlicedMeasure.Wasserstein;
            var summary = check.Mean ? SlicedSummary.Mean : SlicedSummary.Worst;
            var reading = readings.Single(r => r.Measure == measure && r.Summary == summary);
            var own = details.Concat([
                new KeyValuePair<string, string>("floor", InvariantNumber.Exact(reading.Floor)), new("floor_spread", InvariantNumber.Exact(reading.FloorSpread)),
                new("worst_projection", InvariantNumber.Count(reading.WorstProjection)),
                new("worst_projection_value", InvariantNumber.Exact(reading.PerProjection[reading.WorstProjection])),
            ]).ToList();
            if (!double.IsFinite(reading.Estimate) || !double.IsFinite(reading.Bias) || !double.IsFinite(reading.Errors.Total))
            {
                result.Add((check, Measurement.Impossible(
                    $"{check.Label}: the distance or its uncertainty is undefined (a resampled projection with no positive weight), estimate {InvariantNumber.Short(reading.Estimate)}", own)));
                continue;
            }
            var boundary = bootstrap.BoundaryReplicas(measure, summary, reading.Estimate, check.Tolerance);
            var name = measure == SlicedMeasure.KolmogorovSmirnov ? "KS" : "W1/σ";
            var over = summary == SlicedSummary.Worst ? $"worst of {reference.Projections} projections (projection {reading.WorstProjection})" : $"mean of {reference.Projections} projections";
            // DistanceDecision appends the uncorrected value and the error to this text, so the value comes last.
            result.Add((check, DistanceDecision.Measure(reading.Estimate, reading.Bias, reading.Errors, boundary, check, decision, sampleEvents,
                $"sliced {name}, {over}, floor {InvariantNumber.Short(reading.Floor)}: {InvariantNumber.Short(Math.Max(0, reading.Estimate - reading.Bias))}", own)));
        }
        return result;
    }
}
