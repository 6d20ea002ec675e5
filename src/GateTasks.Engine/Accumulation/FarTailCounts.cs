namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Weight beyond the reference's 0.1% and 99.9% quantiles (<see cref="Low"/>, <see cref="High"/>): Σw and Σw² below
/// the low one, above the high one, and in total (NaN and spike values excluded).
/// </summary>
internal sealed record FarTailCounts(double Low, double High, double BelowW, double BelowW2, double AboveW, double AboveW2, double TotalW, double TotalW2);
