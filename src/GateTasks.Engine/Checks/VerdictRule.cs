using GateTasks.Engine.Contracts;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Checks;

/// <summary>
/// Turns the measurements of a whole contract's tolerance checks into verdicts. Fail: the check's p-value, adjusted
/// over every tolerance check of the contract (Holm 1979 by default), is at most the family-wise false-alarm level —
/// so a faithful surrogate fails a build with at most that probability however many checks the contract has, and a
/// fail always means "outside a stated tolerance". Pass: the effect's upper confidence bound is below the tolerance
/// (an equivalence test, Schuirmann 1987). Goodness-of-fit tests are not in this family: a run reads them apart
/// (<see cref="TestReadingRule"/>, called by <see cref="ContractEvaluation"/>); a test handed here (the simulated
/// replicas of plan and calibrate) is left out of the correction and can neither fail nor hold a run back.
/// Otherwise inconclusive (as is a check whose effect could not be computed, <see cref="Measurement.Uncomputable"/>), with the surrogate events that would decide it (<see cref="NeededEvents"/>, which needs the
/// family's size: the fail side is solved at its strictest level).
/// </summary>
internal static class VerdictRule
{
    /// <param name="items">Every check of the contract with what it measured.</param>
    /// <param name="decision">The contract's decision settings.</param>
    /// <param name="sampleEvents">
    /// The whole sample's events, to carry a category's events needed over to the sample's (0: not known); null when
    /// no report will show the events needed (the simulated replicas of plan and calibrate), which are then not solved.
    /// </param>
    public static List<CheckOutcome> Decide(IReadOnlyList<(CheckSubject Subject, CheckSpec Check, Measurement Measured)> items, DecisionSettings decision,
        long? sampleEvents = null)
    {
        // The family is the tolerance checks alone; index[i] is item i's place in it (−1 for a goodness-of-fit test).
        var index = new int[items.Count];
        var family = new List<double>(items.Count);
        for (var i = 0; i < items.Count; i++)
        {
            if (items[i].Check is GoodnessOfFitTest) { index[i] = -1; continue; }
            index[i] = family.Count;
            family.Add(double.IsNaN(items[i].Measured.PValue) ? 1.0 : Math.Clamp(items[i].Measured.PValue, 0, 1));
        }
        var p = family.ToArray();
        var adjusted = p.Length == 0 ? [] : MultipleTesting.Adjust(p, decision.Correction);
        var rejected = p.Length == 0 ? [] : MultipleTesting.Reject(p, decision.FalseAlarm, decision.Correction);
        var levels = p.Length == 0 ? [] : MultipleTesting.PerTestLevels(p, decision.FalseAlarm, decision.Correction);
        var outcomes = new List<CheckOutcome>(items.Count);
        for (var i = 0; i < items.Count; i++)
        {
            var (subject, check, m) = items[i];
            if (index[i] < 0)
            {
                // Outside the fail family: it cannot fail a replica, nor keep one from passing.
                outcomes.Add(new CheckOutcome(subject, check, m, Verdict.Pass, double.NaN, double.NaN));
                continue;
            }
            var k = index[i];
            Verdict verdict;
            // Nothing measured is nothing decided: an uncomputable effect is inconclusive, never a fail (its p-value of
            // NaN entered the family as 1, so it cannot be rejected) nor a pass.
            if (m.Uncomputable || (check is ToleranceCheck && double.IsNaN(m.Estimate))) verdict = Verdict.Inconclusive;
            else if (rejected[k]) verdict = Verdict.Fail;
            else if (check is ToleranceCheck bounded && m.Upper < bounded.Tolerance) verdict = Verdict.Pass;
            else verdict = Verdict.Inconclusive;
            outcomes.Add(new CheckOutcome(subject, check, m, verdict, adjusted[k], levels[k])
            {
                Needed = verdict == Verdict.Inconclusive && !m.Uncomputable && sampleEvents is { } events ? NeededEvents.For(subject, check, m, decision, p.Length, events) : null,
            });
        }
        return outcomes;
    }
}
