namespace GateTasks.Engine.Statistics;

/// <summary>Two-sample Cramér–von Mises result: Anderson's U and T, the p-value and "exact"/"asymptotic".</summary>
internal readonly record struct CramerVonMisesResult(double U, double T, double PValue, string Method);
