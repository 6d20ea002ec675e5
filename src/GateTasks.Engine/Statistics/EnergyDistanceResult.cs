namespace GateTasks.Engine.Statistics;

/// <summary>
/// Two-sample energy test result: the E-statistic (V-statistic form), the scaled test statistic
/// T = nm/(n+m)·E, the permutation p-value and the number of permutations it rests on.
/// </summary>
internal readonly record struct EnergyDistanceResult(double EStatistic, double TestStatistic, double PValue, int Permutations);
