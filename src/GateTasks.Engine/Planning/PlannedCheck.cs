using GateTasks.Engine.Calibration;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Planning;

/// <summary>
/// The plan for one tolerance check of a feature or a pair (<see cref="Subject"/>). <see cref="EventsToPass"/>: the smallest surrogate size (on a grid of quarter octaves) at
/// which a perfect surrogate passed in at least the target share of replicas (<see cref="PassRate"/>, with
/// <see cref="PassRateNoise"/> its binomial standard deviation); null when no size up to the plan's largest does —
/// the reference's own noise is then too large for the tolerance. <see cref="DetectableDrift"/>: the smallest drift of
/// <see cref="Family"/> (its kind; its size is the drift) that failed the check in at least the plan's power of
/// replicas at the plan's detection size, with <see cref="EffectAtDrift"/> the check's effect that drift truly makes;
/// null when none up to <see cref="DriftSearchedUpTo"/> does, or (<see cref="Family"/> null) when the check's input is not simulated.
/// </summary>
internal sealed record PlannedCheck(
    CheckSubject Subject,
    CheckSpec Check,
    long? EventsToPass,
    double PassRate,
    double PassRateNoise,
    DriftKind? Family,
    double? DetectableDrift,
    double DetectionRate,
    double? EffectAtDrift,
    double DriftSearchedUpTo);
