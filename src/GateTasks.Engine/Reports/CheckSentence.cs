using GateTasks.Engine.Checks;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The one sentence that says why a check did not pass, used alike by the console's coded message, the JUnit
/// failure and the HTML report, so the three never word it differently: "feature 'm_gg' ratio-max[core]: &lt;what was
/// measured&gt;; uses 130% of its tolerance (estimate 110%)", and for an inconclusive check "… is inconclusive:
/// &lt;what was measured&gt;; &lt;what would decide it&gt;; uses …".
/// </summary>
internal static class CheckSentence
{
    public static string Of(CheckOutcome o, Contracts.DecisionSettings decision)
    {
        var who = $"feature '{SubjectLabel.Of(o.Subject)}' {o.Check.Label}";
        var headroom = HeadroomText.Of(Headroom.Of(o, decision));
        return o.Verdict == Verdict.Inconclusive
            ? $"{who} is inconclusive: {o.Summary}; {UndecidedReason.Of(o)}; {headroom}"
            : $"{who}: {o.Summary}; {headroom}";
    }
}
