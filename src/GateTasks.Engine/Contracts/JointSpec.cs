using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// A multivariate check over a declared feature set: the energy-distance two-sample test (Székely &amp; Rizzo 2004)
/// on bounded subsamples of reference and sample, so that a broken joint structure fails even when every marginal
/// passes. <see cref="Test"/> is its entry in the contract's family of tests, read beside the verdict as a diagnostic.
/// </summary>
internal sealed record JointSpec(IReadOnlyList<string> Features, int Subsample, int Permutations, GoodnessOfFitTest Test, SourceLocation Location)
{
    public const int DefaultSubsample = 2000;
    /// <summary>Permutations when the contract states none: enough that the smallest p-value, 1/(B + 1), can still fail after the correction.</summary>
    public int PermutationsFor(int familySize, double falseAlarm) =>
        Permutations > 0 ? Permutations : (int)Math.Clamp(Math.Ceiling(2 * familySize / falseAlarm), 199, 10_000);

    /// <summary>Name used in reports, e.g. <c>joint(e_lead,e_sublead,pt_gg)</c>.</summary>
    public string Name => $"joint({string.Join(",", Features)})";
}
