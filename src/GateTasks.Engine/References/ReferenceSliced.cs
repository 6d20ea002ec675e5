using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.References;

/// <summary>
/// What the reference stores for a joint block's sliced checks (only when its contract states one): the grid the
/// projections are filled on (<see cref="SlicedGrid"/>: features, directions, standardisation, edges) and the
/// reference's own histograms on it, with the groups of rows the uncertainty resamples.
/// </summary>
internal sealed record ReferenceSliced(SlicedGrid Grid, SlicedHistograms Histograms);
