using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.References;

/// <summary>
/// What the reference stores for the joint block's streamed checks: the joint features, the weighted means and
/// standard deviations that standardise them (over the reference's rows with every joint feature finite), and the
/// standardised rows' per-block moments and kernel sums (<see cref="JointMoments"/>), each present when the contract it
/// was built for asked for the check that reads it.
/// </summary>
internal sealed record ReferenceJointMoments(IReadOnlyList<string> Features, JointStandardisation Standardisation, JointMomentsState State);
