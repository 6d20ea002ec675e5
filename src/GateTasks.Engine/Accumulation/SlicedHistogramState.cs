using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// A <see cref="SlicedHistogramCounter"/>'s state: the number of groups, the groups' cells and tail moments
/// (<see cref="GroupCells"/>, laid out projection after projection, the groups of a projection side by side, each as [below moment,
/// cells with the flows, above moment]), the Σw² of the same entries summed over groups (<see cref="CellSquares"/>),
/// per projection Σw, Σw·p and Σw·p² (<see cref="Moments"/>), and the rows counted and skipped. Every sum is exact.
/// </summary>
internal sealed record SlicedHistogramState(int Groups, ExactSumArrayState GroupCells, ExactSumArrayState CellSquares,
    ExactSumArrayState Moments, long Rows, long Skipped);
