using GateTasks.Engine.Contracts;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Reads the contract's goodness-of-fit tests as a family of their own, apart from the tolerance checks: each p-value
/// is adjusted over the tests alone with the contract's correction (Holm 1979 by default), and a test whose adjusted
/// p-value is at most the contract's false-alarm level reads "distinguishable at this size" — so a claim that any of
/// them is distinguishable holds family-wise at that level. Nothing here passes or fails anything.
/// </summary>
internal static class TestReadingRule
{
    /// <param name="items">Every goodness-of-fit test of the contract with what it measured, in contract order.</param>
    /// <param name="decision">The contract's decision settings (false-alarm level and correction).</param>
    public static List<TestReading> Read(IReadOnlyList<(CheckSubject Subject, GoodnessOfFitTest Test, Measurement Measured)> items, DecisionSettings decision)
    {
        if (items.Count == 0) return [];
        // An uncomputable test carries no evidence: it enters the family as p = 1, so it cannot be called distinguishable.
        var p = items.Select(i => double.IsNaN(i.Measured.PValue) || i.Measured.Uncomputable ? 1.0 : Math.Clamp(i.Measured.PValue, 0, 1)).ToArray();
        var adjusted = MultipleTesting.Adjust(p, decision.Correction);
        var rejected = MultipleTesting.Reject(p, decision.FalseAlarm, decision.Correction);
        var levels = MultipleTesting.PerTestLevels(p, decision.FalseAlarm, decision.Correction);
        var readings = new List<TestReading>(items.Count);
        for (var i = 0; i < items.Count; i++)
        {
            var (subject, test, m) = items[i];
            var finding = m.Uncomputable ? Distinguishability.NotMeasured
                : rejected[i] ? Distinguishability.Distinguishable : Distinguishability.NotDistinguishable;
            readings.Add(new TestReading(subject, test, m, finding, adjusted[i], levels[i]));
        }
        return readings;
    }
}
