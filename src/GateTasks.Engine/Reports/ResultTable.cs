using System.Globalization;
using System.Text;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Runs;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The plain-text table of a check run: one row per feature × check × region with the estimate, its confidence
/// interval, the tolerance, the verdict and, for inconclusive checks, the surrogate events needed to decide.
/// No colour codes, so it reads the same in logs and reports.
/// </summary>
internal static class ResultTable
{
    public static string Format(RunResult report)
    {
        var confidence = IntervalHeader(report);
        string[] header = ["feature", "check", "region", "estimate", confidence, "tolerance", "used", "adj. p", "verdict", "events needed"];
        var rows = new List<string[]> { header };
        // Failures first, then the undecided checks, then the passes; contract order within each.
        foreach (var o in report.Outcomes.OrderBy(o => FeatureOutcomes.Rank(o.Verdict)))
        {
            var m = o.Measured;
            rows.Add([
                SubjectLabel.Of(o.Subject),
                o.Check.Key,
                o.Check.RegionName,
                InvariantNumber.Short(m.Estimate),
                IntervalText(o),
                ToleranceText(o),
                HeadroomText.Cell(Headroom.Of(o, report.Contract.Decision)),
                InvariantNumber.Short(o.AdjustedPValue),
                VerdictText(o.Verdict),
                o.Verdict == Verdict.Inconclusive ? UndecidedReason.Cell(o) : "",
            ]);
        }
        var widths = Enumerable.Range(0, header.Length).Select(c => rows.Max(r => r[c].Length)).ToArray();
        var sb = new StringBuilder();
        for (var i = 0; i < rows.Count; i++)
        {
            sb.AppendLine(string.Join("  ", rows[i].Select((cell, c) => c is 3 or 5 or 6 or 7 ? cell.PadLeft(widths[c]) : cell.PadRight(widths[c]))).TrimEnd());
            if (i == 0) sb.AppendLine(string.Join("  ", widths.Select(w => new string('-', w))));
        }
        sb.AppendLine(UsedNote);
        sb.AppendLine(DecisionRule(report));
        KernelRows(sb, report);
        Readings(sb, report);
        Flows(sb, report);
        return sb.ToString();
    }

    /// <summary>
    /// What the console's compact form keeps of the table (<c>check</c> without <c>--all-checks</c>): the notes on
    /// how kernel distances were subsampled and the goodness-of-fit readings, which qualify the verdict; empty when
    /// there are none. The rows of the checks and the flows are left to the full table.
    /// </summary>
    public static string Compact(RunResult report)
    {
        var sb = new StringBuilder();
        KernelRows(sb, report);
        Readings(sb, report);
        return sb.ToString();
    }

    /// <summary>How many sample rows each kernel distance was computed on: its seeded subsample of at most kernel-rows.</summary>
    private static void KernelRows(StringBuilder sb, RunResult report)
    {
        foreach (var o in report.Outcomes)
        {
            if (o.Check.Kind != CheckKind.KernelDistance) continue;
            var d = o.Measured.Details.ToDictionary(p => p.Key, p => p.Value);
            if (d.TryGetValue("kernel_sample_rows", out var used) && d.TryGetValue("sample_rows", out var all) && d.TryGetValue("kernel_rows_limit", out var limit))
                sb.AppendLine($"{o.Check.Key} of {o.Subject.Name}: sample side on {used} of {all} rows (kernel-rows {limit}; every reference row).");
        }
    }

    /// <summary>
    /// The goodness-of-fit tests' readings, in a table of their own under the verdicts: diagnostics beside the verdict,
    /// worded "distinguishable at this size" or not, never pass or fail.
    /// </summary>
    private static void Readings(StringBuilder sb, RunResult report)
    {
        if (report.Readings.Count == 0) return;
        string[] header = ["diagnostic (not a verdict)", "test", "statistic", "p-value", "adj. p", "reading"];
        var rows = new List<string[]> { header };
        foreach (var r in report.Readings)
            rows.Add([r.Subject.Name, r.Test.Label, InvariantNumber.Short(r.Statistic), InvariantNumber.Short(r.Measured.PValue),
                InvariantNumber.Short(r.AdjustedPValue), r.Finding == Distinguishability.NotMeasured ? r.Text : r.Finding.Words()]);
        var widths = Enumerable.Range(0, header.Length).Select(c => rows.Max(r => r[c].Length)).ToArray();
        sb.AppendLine();
        for (var i = 0; i < rows.Count; i++)
        {
            sb.AppendLine(string.Join("  ", rows[i].Select((cell, c) => c is 2 or 3 or 4 ? cell.PadLeft(widths[c]) : cell.PadRight(widths[c]))).TrimEnd());
            if (i == 0) sb.AppendLine(string.Join("  ", widths.Select(w => new string('-', w))));
        }
        sb.AppendLine(ReadingRule(report));
    }

    /// <summary>One sentence stating how the readings were made and that they do not decide anything.</summary>
    public static string ReadingRule(RunResult report)
    {
        var d = report.Contract.Decision;
        return $"Goodness-of-fit tests are diagnostics beside the verdict: \"distinguishable at this size\" when the {d.CorrectionName}-adjusted p-value " +
               $"≤ {InvariantNumber.Short(d.FalseAlarm)} (family of the {report.Readings.Count} test{(report.Readings.Count == 1 ? "" : "s")} alone); " +
               "they do not change the outcome, the exit code or the build.";
    }

    /// <summary>"; 3 goodness-of-fit diagnostics beside the verdict (1 distinguishable at this size)", or empty without tests.</summary>
    public static string ReadingsClause(RunResult report)
    {
        if (report.Readings.Count == 0) return "";
        var distinguishable = report.Readings.Count(r => r.Finding == Distinguishability.Distinguishable);
        return $" {report.Readings.Count} goodness-of-fit diagnostic{(report.Readings.Count == 1 ? "" : "s")} beside the verdict " +
               $"({distinguishable} distinguishable at this size).";
    }

    /// <summary>
    /// Each feature's share of weight outside its bins (the flow cells), in reference and sample: the binned checks
    /// do not compare it, so it is shown.
    /// </summary>
    private static void Flows(StringBuilder sb, RunResult report)
    {
        if (report.Comparisons.Count == 0) return;
        string[] header = ["outside the bins", "reference below", "above", "sample below", "above"];
        var rows = new List<string[]> { header };
        foreach (var c in report.Comparisons)
        {
            var (rb, _, ra) = BinCoverage.Shares(c.Reference.Histogram);
            var (sbw, _, sa) = BinCoverage.Shares(c.Surrogate);
            rows.Add([c.Spec.Name, BinCoverage.Percent(rb), BinCoverage.Percent(ra), BinCoverage.Percent(sbw), BinCoverage.Percent(sa)]);
        }
        var widths = Enumerable.Range(0, header.Length).Select(c => rows.Max(r => r[c].Length)).ToArray();
        sb.AppendLine();
        foreach (var row in rows)
            sb.AppendLine(string.Join("  ", row.Select((cell, c) => c == 0 ? cell.PadRight(widths[c]) : cell.PadLeft(widths[c]))).TrimEnd());
    }

    /// <summary>What the "used" column holds.</summary>
    public const string UsedNote = "used: the share of its tolerance the check's upper bound uses (the estimate's in brackets); above 100% the bound lies outside the tolerance.";

    /// <summary>"95% interval": the column heading of the confidence intervals at the contract's confidence.</summary>
    public static string IntervalHeader(RunResult report) =>
        (report.Contract.Decision.Confidence * 100).ToString("0.#", CultureInfo.InvariantCulture) + "% interval";

    /// <summary>"[lower, upper]" of an effect's confidence interval; "—" for tests and impossible measurements.</summary>
    public static string IntervalText(CheckOutcome o) =>
        o.Check is GoodnessOfFitTest || double.IsNaN(o.Measured.Upper) ? "—" : $"[{InvariantNumber.Short(o.Measured.Lower)}, {InvariantNumber.Short(o.Measured.Upper)}]";

    /// <summary>"≤ 0.03" for an effect check; "—" for a test, which has no tolerance.</summary>
    public static string ToleranceText(CheckOutcome o) => o.Check is ToleranceCheck bounded ? "≤ " + InvariantNumber.Short(bounded.Tolerance) : "—";

    /// <summary>One sentence stating how the verdicts were reached.</summary>
    public static string DecisionRule(RunResult report)
    {
        var d = report.Contract.Decision;
        return $"Fail when the {d.CorrectionName}-adjusted p-value ≤ {InvariantNumber.Short(d.FalseAlarm)} (family of {report.Outcomes.Count} tolerance checks); " +
               $"pass when the upper bound of the {IntervalHeader(report)} is below the tolerance; inconclusive {(d.InconclusiveFails ? "fails" : "warns")}.";
    }

    public static string VerdictText(Verdict v) => v switch
    {
        Verdict.Pass => "pass",
        Verdict.Fail => "FAIL",
        _ => "inconclusive",
    };

    /// <summary>
    /// The table's "events needed" cell of an inconclusive check: "≈1200000" surrogate events, for a category also
    /// its own ("≈1200000 (≈4000 in category)"), a trailing "?" when the reference caps the chance at even, or "more
    /// reference events" when no surrogate size decides it; empty for a decided check.
    /// </summary>
    public static string EventsText(CheckOutcome o)
    {
        if (o.Needed is not { } n) return "";
        if (n.ReferenceLimits) return "more reference events";
        if (double.IsNaN(n.Events)) return "";
        var text = Rounded(n.Events) + (double.IsNaN(n.CategoryEvents) ? "" : $" ({Rounded(n.CategoryEvents)} in category)");
        return n.Chance < NeededEvents.Power ? text + "?" : text;
    }

    /// <summary>"≈1200000": three significant digits, rounded up.</summary>
    public static string Rounded(double events)
    {
        if (double.IsPositiveInfinity(events)) return "∞";
        if (double.IsNaN(events)) return "";
        // Three significant digits: the estimate assumes the observed deviations persist, no more precision is meant.
        var magnitude = Math.Pow(10, Math.Max(0, Math.Floor(Math.Log10(Math.Max(events, 1))) - 2));
        return "≈" + (Math.Ceiling(events / magnitude) * magnitude).ToString("0", CultureInfo.InvariantCulture);
    }

    /// <summary>
    /// What would decide an inconclusive check, in words: "≈1200000 surrogate events needed to decide (a 90% chance
    /// to pass if the effect is as estimated)"; for a category, its own events and the whole sample's at its share;
    /// when the reference caps the chance, that size with the cap said; when no surrogate size decides, "more reference
    /// events needed to decide: at the effect as estimated, no surrogate sample size is enough".
    /// </summary>
    public static string NeededText(CheckOutcome o) => NeededText(o.Needed ?? NeededEvents.Unknown);

    /// <inheritdoc cref="NeededText(CheckOutcome)"/>
    public static string NeededText(NeededEvents n)
    {
        if (n.ReferenceLimits) return "more reference events needed to decide: at the effect as estimated, no surrogate sample size is enough";
        if (double.IsNaN(n.Events)) return "more surrogate events needed to decide";
        var size = double.IsNaN(n.CategoryEvents)
            ? $"{Rounded(n.Events)} surrogate events needed to decide"
            : $"{Rounded(n.CategoryEvents)} events in this category needed to decide, {Rounded(n.Events)} surrogate events at its share of " +
              (n.Share * 100).ToString("0.###", CultureInfo.InvariantCulture) + "%";
        if (double.IsNaN(n.Chance)) return size;
        var way = n.Side == DecidingSide.Pass ? "pass" : "fail";
        return n.Chance >= NeededEvents.Power
            ? $"{size} (a {Percent(n.Chance)} chance to {way} if the effect is as estimated)"
            : $"{size} (only an even chance to {way} if the effect is as estimated: the reference's own uncertainty leaves no more; more reference events would help)";
    }

    private static string Percent(double p) => (p * 100).ToString("0", CultureInfo.InvariantCulture) + "%";

    /// <summary>The global score with its error, or why there is none (<see cref="GlobalScore.Text"/>): information, not a verdict.</summary>
    public static string ScoreLine(RunResult report) => report.Score.Text;

    /// <summary>One line saying what was checked and how it went; for an undecided run, also what would decide it.</summary>

    public static string Summary(RunResult report)
    {
        var verdict = report.Outcome.Word();
        var passed = report.Outcomes.Count(o => o.Verdict == Verdict.Pass);
        var line = $"{verdict}: {passed} of {report.Outcomes.Count} checks within tolerance, {report.Failures} failed, {report.Inconclusive} inconclusive " +
                   $"({report.Contract.Features.Count} features, {InvariantNumber.Count(report.Events)} surrogate events, " +
                   $"effective {report.EffectiveEvents.ToString("0", CultureInfo.InvariantCulture)}; reference {InvariantNumber.Count(report.Reference.Events)} events).";
        line += ReadingsClause(report);
        return report.Outcome == RunOutcome.Undecided ? line + " " + UndecidedNote(report) : line;
    }

    /// <summary>
    /// Why a run is undecided and what would decide it: the inconclusive checks (which fail the build or only warn, as
    /// the contract says) and the surrogate events the most demanding of them needs (each check's own number is in the
    /// table), and the subjects covered only by goodness-of-fit tests, which nothing shows within a tolerance.
    /// </summary>
    public static string UndecidedNote(RunResult report)
    {
        var uncovered = report.UncoveredSubjects;
        var open = report.Outcomes.Where(o => o.Verdict == Verdict.Inconclusive).ToList();
        var uncoveredText = uncovered.Count == 0 ? "" :
            $"{uncovered.Count} subject{(uncovered.Count == 1 ? " has" : "s have")} goodness-of-fit tests and no tolerance check " +
            $"({string.Join(", ", uncovered.Take(5).Select(s => s.Name))}{(uncovered.Count > 5 ? $" and {uncovered.Count - 5} more" : "")}): " +
            "a test does not show a tolerance met, so nothing shows " + (uncovered.Count == 1 ? "it" : "them") + " within one; " +
            (report.Contract.Decision.InconclusiveFails ? "this fails the build under this contract (decision.inconclusive: fail)." : "this only warns under this contract.");
        if (open.Count == 0) return "Not everything was shown within a tolerance: " + uncoveredText;
        var needed = open.Select(o => o.Needed ?? NeededEvents.Unknown).ToList();
        // The largest number decides them all; a check that no sample size decides (the reference limits it) says so.
        var most = needed.FirstOrDefault(n => n.ReferenceLimits)
            ?? needed.Where(n => double.IsFinite(n.Events)).MaxBy(n => n.Events) ?? NeededEvents.Unknown;
        // The sample is generated whole: the most demanding check's whole-sample figure is what to generate.
        if (!double.IsNaN(most.CategoryEvents)) most = most with { CategoryEvents = double.NaN, Share = 1 };
        var names = string.Join(", ", open.Take(3).Select(o => $"{o.Subject.Name} {o.Check.Label}")) + (open.Count > 3 ? $" and {open.Count - 3} more" : "");
        return $"Not every tolerance was shown met: {open.Count} inconclusive check{(open.Count == 1 ? "" : "s")} ({names}) " +
               (report.Contract.Decision.InconclusiveFails
                   ? (open.Count == 1 ? "fails" : "fail") + " the build under this contract (decision.inconclusive: fail); "
                   : (open.Count == 1 ? "only warns" : "only warn") + " under this contract; ") +
               NeededText(most) + "." + (uncoveredText.Length > 0 ? " Also " + uncoveredText : "");
    }
}
