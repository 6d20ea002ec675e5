namespace GateTasks.Engine.Histograms;

/// <summary>
/// An <see cref="ExactHistogram"/>'s whole state as plain numbers (every exact sum as its terms), so that another
/// process can add it back without losing a bit: entries, NaN entries, the cells, and the NaN cell's Σw and Σw².
/// </summary>
internal sealed record ExactHistogramState(long Entries, long NanEntries, ExactCellsState Cells, IReadOnlyList<double> NanW, IReadOnlyList<double> NanW2);

/// <summary>Every cell's Σw and Σw² as the terms of its exact sum.</summary>
internal sealed record ExactCellsState(IReadOnlyList<IReadOnlyList<double>> SumW, IReadOnlyList<IReadOnlyList<double>> SumW2);
