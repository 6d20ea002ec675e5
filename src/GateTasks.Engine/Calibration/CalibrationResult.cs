using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Calibration;

/// <summary>How often a contract failed (and was inconclusive) over replicas of one drift at one sample size.</summary>
internal sealed record CalibrationResult(Drift Drift, string? Feature, long Events, int Replicas, int Failed, int Inconclusive)
{
    /// <summary>Share of replicas in which the contract failed: the false-alarm rate for null replicas, the detection rate otherwise.</summary>
    public double FailRate => Replicas > 0 ? (double)Failed / Replicas : double.NaN;

    /// <summary>95% Clopper–Pearson (1934) interval of <see cref="FailRate"/>.</summary>
    public (double Lower, double Upper) FailRateInterval => BinomialInterval.ClopperPearson(Failed, Replicas, 0.95);

    /// <summary>Share of replicas with no failure but at least one inconclusive check.</summary>
    public double InconclusiveRate => Replicas > 0 ? (double)Inconclusive / Replicas : double.NaN;

    /// <summary>The surrogate's event weights in these replicas.</summary>
    public WeightLaw Weights { get; init; } = WeightLaw.Unit;

    /// <summary>Every check's own rates, in the contract's order (features, pairs, the joint block).</summary>
    public IReadOnlyList<CheckTally> Checks { get; init; } = [];
}
