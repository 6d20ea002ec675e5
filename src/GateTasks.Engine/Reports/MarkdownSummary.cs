using System.Globalization;
using System.Text;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// A check run in GitHub-flavoured Markdown, for a pull-request comment or a CI job summary: a verdict line, a
/// table of the failing and inconclusive checks, the counts, the passing checks folded into a details block, and the
/// goodness-of-fit tests' readings in a table of their own (diagnostics beside the verdict, never pass or fail).
/// </summary>
internal static class MarkdownSummary
{
    public static void Write(string path, RunResult report) => AtomicFile.WriteText(path, Render(report));

    public static string Render(RunResult report)
    {
        var sb = new StringBuilder();
        var passed = report.Outcomes.Where(o => o.Verdict == Verdict.Pass).ToList();
        var open = report.Outcomes.Where(o => o.Verdict != Verdict.Pass)
            .OrderBy(o => FeatureOutcomes.Rank(o.Verdict)).ToList();
        sb.Append("### GateTasks check ").Append(report.Outcome.Word())
          .Append(": ").Append(Text(report.Contract.DisplayName)).Append("\n\n");
        // Ledger errors first: the checks may pass while the contract in use is not the accepted one.
        foreach (var f in report.Acceptance.Where(f => f.IsError))
            sb.Append("- **").Append(f.Code).Append("** ").Append(Text(f.Message)).Append('\n');
        if (report.Acceptance.Any(f => f.IsError)) sb.Append('\n');
        // Subjects that only tests cover hold the run back from PASSED: said before the counts.
        foreach (var subject in report.UncoveredSubjects)
            sb.Append("- **").Append(ErrorCodes.SubjectWithoutTolerance).Append("** ").Append(Text(RunDiagnostics.UncoveredText(subject))).Append('\n');
        if (report.UncoveredSubjects.Count > 0) sb.Append('\n');
        sb.Append($"**{report.Failures} failed**, **{report.Inconclusive} inconclusive**, {passed.Count} passed of {report.Outcomes.Count} checks " +
                  $"on {report.Contract.Features.Count} features")
          .Append(report.Inconclusive == 0 ? ""
              : report.Contract.Decision.InconclusiveFails ? " (inconclusive checks fail the build under this contract)"
              : " (inconclusive checks only warn under this contract)")
          .Append(".\n\n");
        // The checks closest to their tolerance, right under the verdict and counts.
        var binding = BindingChecks.Of(report);
        if (binding.Count > 0)
        {
            sb.Append(Text(BindingChecks.Heading(binding.Count))).Append("\n\n");
            for (var i = 0; i < binding.Count; i++)
                sb.Append(i + 1).Append(". ").Append(Code(SubjectLabel.Of(binding[i].Outcome.Subject))).Append(' ').Append(Text(binding[i].Outcome.Check.Label))
                  .Append(": ").Append(Text(HeadroomText.Of(binding[i].Headroom)))
                  .Append(binding[i].Outcome.Verdict == Verdict.Inconclusive ? ", inconclusive" : "").Append('\n');
            sb.Append('\n');
        }
        // Slow degradation across retrainings, said while the checks still pass (HeadroomTrend).
        var worse = HeadroomTrend.WorsenedSentences(report);
        foreach (var line in worse) sb.Append("- ").Append(Text(line)).Append('\n');
        if (worse.Count > 0) sb.Append('\n');
        sb.Append(Text(report.Score.Text)).Append("\n\n");
        sb.Append("Sample ").Append(string.Join(", ", report.SampleFiles.Take(3).Select(f => Code(Path.GetFileName(f)))))
          .Append(report.SampleFiles.Count > 3 ? $" and {report.SampleFiles.Count - 3} more" : "")
          .Append($": {InvariantNumber.Count(report.Events)} events (effective {report.EffectiveEvents.ToString("0", CultureInfo.InvariantCulture)}); ")
          .Append("reference ").Append(Code(Path.GetFileName(report.ReferencePath))).Append($" ({InvariantNumber.Count(report.Reference.Events)} events, sha256 {report.ReferenceSha256[..Math.Min(12, report.ReferenceSha256.Length)]}…).\n\n");

        if (open.Count > 0)
        {
            sb.Append("| feature | check | region | estimate | tolerance | used | verdict |\n");
            sb.Append("|---|---|---|---:|---:|---:|---|\n");
            foreach (var o in open)
            {
                var verdict = o.Verdict == Verdict.Fail ? "**FAIL**" : o.Measured.Uncomputable ? "inconclusive (" + o.Summary + ")" : "inconclusive" + Needed(o);
                Row(sb, Code(SubjectLabel.Of(o.Subject)), o.Check.Key, o.Check.RegionName, InvariantNumber.Short(o.Measured.Estimate), ResultTable.ToleranceText(o),
                    Used(report, o), verdict);
            }
            sb.Append('\n');
        }

        if (passed.Count > 0)
        {
            sb.Append("<details><summary>").Append(passed.Count).Append(" passing check").Append(passed.Count == 1 ? "" : "s").Append("</summary>\n\n");
            sb.Append("| feature | check | region | estimate | tolerance | used |\n");
            sb.Append("|---|---|---|---:|---:|---:|\n");
            foreach (var o in passed)
                Row(sb, Code(SubjectLabel.Of(o.Subject)), o.Check.Key, o.Check.RegionName, InvariantNumber.Short(o.Measured.Estimate), ResultTable.ToleranceText(o), Used(report, o));
            sb.Append("\n</details>\n\n");
        }
        sb.Append(Text(ResultTable.UsedNote)).Append(' ').Append(Text(ResultTable.DecisionRule(report))).Append('\n');
        if (report.Readings.Count > 0)
        {
            sb.Append("\n#### Goodness-of-fit diagnostics (not verdicts)\n\n");
            sb.Append("| subject | test | statistic | p-value | adjusted p | reading |\n");
            sb.Append("|---|---|---:|---:|---:|---|\n");
            foreach (var r in report.Readings)
                Row(sb, Code(r.Subject.Name), r.Test.Label, InvariantNumber.Short(r.Statistic), InvariantNumber.Short(r.Measured.PValue),
                    InvariantNumber.Short(r.AdjustedPValue), Text(r.Finding == Distinguishability.NotMeasured ? r.Text : r.Finding.Words()));
            sb.Append('\n').Append(Text(ResultTable.ReadingRule(report))).Append('\n');
        }
        return sb.ToString();
    }

    private static string Used(RunResult report, CheckOutcome o) => HeadroomText.Cell(Headroom.Of(o, report.Contract.Decision));

    private static string Needed(CheckOutcome o) =>
        o.Needed is not { } n || double.IsNaN(n.Events) ? ""
        : n.ReferenceLimits ? " (needs more reference events)"
        : $" ({ResultTable.EventsText(o)} events needed)";

    private static void Row(StringBuilder sb, params string[] cells) =>
        sb.Append("| ").Append(string.Join(" | ", cells.Select(c => c.Replace("|", "\\|")))).Append(" |\n");

    /// <summary>A name as inline code, which Markdown shows literally (brackets, underscores and all).</summary>
    private static string Code(string text) => "`" + text.Replace("`", "'") + "`";

    /// <summary>Free text with the characters that Markdown or HTML would act on escaped.</summary>
    private static string Text(string text) => MarkdownText.Escape(text);
}
