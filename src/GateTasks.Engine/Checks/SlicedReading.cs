namespace GateTasks.Engine.Checks;

/// <summary>
/// One sliced distance as read by <see cref="SlicedBootstrap"/>: the estimate (the worst or the mean over the
/// projections), the bootstrap bias and standard errors in the form <see cref="DistanceDecision.Measure"/> takes them,
/// the floor (the mean of the distance between replicas of two samples of the reference's law at these sizes, what
/// the estimate reads at zero true distance) with its spread, the per-projection distances and the worst projection.
/// </summary>
internal sealed record SlicedReading(SlicedMeasure Measure, SlicedSummary Summary, double Estimate, double Bias,
    HistogramBootstrap.Errors Errors, double Floor, double FloorSpread, double[] PerProjection, int WorstProjection);
