using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// How verdicts are reached. A check passes when the upper confidence bound of its effect (at
/// <see cref="Confidence"/>) lies below the tolerance; it fails when its p-value, adjusted over every check of the
/// contract by <see cref="Correction"/>, is at most <see cref="FalseAlarm"/> — so a faithful surrogate fails a build
/// with probability at most that level however many checks there are; otherwise it is inconclusive.
/// </summary>
internal sealed record DecisionSettings(
    double Confidence,
    double FalseAlarm,
    MultipleTestingMethod Correction,
    bool InconclusiveFails,
    SourceLocation? Location)
{
    /// <summary>Defaults when the contract has no decision block: 95% confidence, 1% family-wise false alarms, Holm, inconclusive fails.</summary>
    public static DecisionSettings Default { get; } = new(0.95, 0.01, MultipleTestingMethod.Holm, true, null);

    /// <summary>Name of the correction as written in contracts and reports.</summary>
    public string CorrectionName => Correction switch
    {
        MultipleTestingMethod.BenjaminiHochberg => "benjamini-hochberg",
        MultipleTestingMethod.Bonferroni => "bonferroni",
        _ => "holm",
    };
}
