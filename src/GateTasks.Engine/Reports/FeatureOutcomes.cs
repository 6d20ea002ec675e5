using GateTasks.Engine.Checks;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The checks of one reported subject — a feature, or a pair or joint set of features (which have no histograms
/// to plot, so <see cref="Comparison"/> is null) — and its worst verdict.
/// </summary>
internal sealed record FeatureOutcomes(string Name, FeatureComparison? Comparison, IReadOnlyList<CheckOutcome> Outcomes)
{
    /// <summary>Fail if any check failed, else inconclusive if any was, else pass.</summary>
    public Verdict Worst =>
        Outcomes.Any(o => o.Verdict == Verdict.Fail) ? Verdict.Fail
        : Outcomes.Any(o => o.Verdict == Verdict.Inconclusive) ? Verdict.Inconclusive
        : Verdict.Pass;

    /// <summary>Subjects in report order: failing first, then inconclusive, then passing; contract order within each.</summary>
    public static IReadOnlyList<FeatureOutcomes> Group(RunResult report)
    {
        var comparisons = report.Comparisons.ToDictionary(c => c.Spec.Name);
        return report.Outcomes
            .GroupBy(o => o.Subject.Name)
            .Select(g => new FeatureOutcomes(g.Key, comparisons.GetValueOrDefault(g.Key), g.ToList()))
            .OrderBy(f => Rank(f.Worst)) // stable: contract order within each verdict
            .ToList();
    }

    /// <summary>Sort key: failing before inconclusive before passing.</summary>
    public static int Rank(Verdict v) => v switch { Verdict.Fail => 0, Verdict.Inconclusive => 1, _ => 2 };
}
