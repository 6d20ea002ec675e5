using GateTasks.Engine.Checks;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The checks of a run closest to their tolerance: those that did not fail and were measured, by largest upper share
/// (<see cref="Headroom"/>) first, contract order breaking ties. They are what the next retraining is most likely to
/// push over; the failures are listed apart, before them.
/// </summary>
internal static class BindingChecks
{
    /// <summary>How many binding checks the reports list.</summary>
    public const int Count = 5;

    /// <summary>The binding checks of <paramref name="report"/>, at most <paramref name="count"/>, closest to the tolerance first.</summary>
    public static IReadOnlyList<(CheckOutcome Outcome, Headroom Headroom)> Of(RunResult report, int count = Count)
    {
        var decision = report.Contract.Decision;
        return report.Outcomes
            .Where(o => o.Verdict != Verdict.Fail)
            .Select(o => (Outcome: o, Headroom: Headroom.Of(o, decision)))
            .Where(x => x.Headroom.IsMeasured)
            .OrderByDescending(x => x.Headroom.UpperShare) // stable: contract order among equal shares
            .Take(count)
            .ToList();
    }

    /// <summary>The heading the console, Markdown and HTML give the list.</summary>
    public static string Heading(int shown) =>
        shown == 1 ? "Binding check (closest to its tolerance, of those not failed):" : $"Binding checks ({shown} closest to their tolerance, of those not failed):";

    /// <summary>One line per binding check: "m_gg ratio-max[core]: uses 64% of its tolerance (estimate 50%), inconclusive".</summary>
    public static string Line(CheckOutcome o, Headroom h) =>
        $"{SubjectLabel.Of(o.Subject)} {o.Check.Label}: {HeadroomText.Of(h)}" + (o.Verdict == Verdict.Inconclusive ? ", inconclusive" : "");
}
