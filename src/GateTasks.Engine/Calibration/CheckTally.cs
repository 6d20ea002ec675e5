using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Calibration;

/// <summary>
/// How often one check of the contract failed (after the contract-wide correction) over a row's replicas, was
/// inconclusive, and — for a goodness-of-fit test — was significant on its own (its uncorrected p-value at most
/// the contract's false-alarm level: the test's own calibration, whatever family it is decided in).
/// </summary>
internal sealed record CheckTally(string Subject, string Check, bool IsTest, int Replicas, int Failed, int Inconclusive, int Significant)
{
    public double FailRate => Replicas > 0 ? (double)Failed / Replicas : double.NaN;

    /// <summary>95% Clopper–Pearson (1934) interval of <see cref="FailRate"/>.</summary>
    public (double Lower, double Upper) FailRateInterval => BinomialInterval.ClopperPearson(Failed, Replicas, 0.95);

    public double SignificantRate => IsTest && Replicas > 0 ? (double)Significant / Replicas : double.NaN;

    /// <summary>95% Clopper–Pearson (1934) interval of <see cref="SignificantRate"/>.</summary>
    public (double Lower, double Upper) SignificantRateInterval => IsTest ? BinomialInterval.ClopperPearson(Significant, Replicas, 0.95) : (double.NaN, double.NaN);

    /// <summary>Whether a check is a goodness-of-fit test (no tolerance: a p-value alone).</summary>
    public static bool Tests(CheckSpec check) => check is not ToleranceCheck && ContractKeys.IsTest(check.Kind);

    /// <summary>Whether an outcome counts as significant on its own.</summary>
    public static bool IsSignificant(CheckOutcome o, DecisionSettings decision) =>
        Tests(o.Check) && !o.Measured.Uncomputable && o.Measured.PValue <= decision.FalseAlarm;
}
