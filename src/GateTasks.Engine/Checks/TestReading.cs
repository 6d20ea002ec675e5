using GateTasks.Engine.Contracts;

namespace GateTasks.Engine.Checks;

/// <summary>
/// A goodness-of-fit test's reading, reported beside the verdict and never part of it: what it was made on, its
/// <see cref="Measurement"/> (the statistic as estimate, the p-value of "the same distribution"), its p-value adjusted
/// within the contract's tests alone (<see cref="TestReadingRule"/>), the level that was compared with, and what
/// that says (<see cref="Distinguishability"/>). A reading does not change the run's outcome, the exit code or the
/// build result, and it does not cover its subject: a subject with readings and no tolerance check is not shown
/// within any tolerance (the run result lists it as uncovered).
/// </summary>
internal sealed record TestReading(
    CheckSubject Subject,
    GoodnessOfFitTest Test,
    Measurement Measured,
    Distinguishability Finding,
    double AdjustedPValue,
    double Level)
{
    /// <summary>The test's statistic.</summary>
    public double Statistic => Measured.Estimate;

    /// <summary>The finding in words, with its adjusted p-value: "distinguishable at this size (adjusted p 0.0012)".</summary>
    public string Text => Finding == Distinguishability.NotMeasured
        ? Finding.Words() + ": " + Measured.Summary
        : $"{Finding.Words()} (adjusted p {Diagnostics.InvariantNumber.Short(AdjustedPValue)})";
}
