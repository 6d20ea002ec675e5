namespace GateTasks.Engine.Statistics;

/// <summary>A test statistic, its p-value and how the p-value was obtained (e.g. "exact", "asymptotic").</summary>
internal readonly record struct TestResult(double Statistic, double PValue, string Method);
