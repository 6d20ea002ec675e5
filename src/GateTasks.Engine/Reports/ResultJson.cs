using System.Text;
using System.Text.Json;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.IO;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// A finished check run as JSON (<c>check --json</c>, <c>accept --json</c>), for a training loop or an experiment
/// tracker to log per checkpoint: the run's outcome and counts, its binding checks, the identity of what was compared
/// (the contract's and reference's SHA-256, the sample's files), and every tolerance check's estimate, interval,
/// tolerance, headroom, p-values, verdict and the events that would decide it. docs/result-json.md describes every
/// field, docs/result.schema.json is its schema. Written atomically.
/// </summary>
internal static class ResultJson
{
    /// <summary>Writes the result of <paramref name="report"/> as the document of <paramref name="command"/>; <paramref name="acceptedEntry"/> is the ledger entry <c>accept</c> recorded.</summary>
    public static void Write(string path, RunResult report, string command = "check", int? acceptedEntry = null) =>
        AtomicFile.WriteText(path, Render(report, command, acceptedEntry));

    public static string Render(RunResult report, string command = "check", int? acceptedEntry = null)
    {
        using var buffer = new MemoryStream();
        using (var w = new Utf8JsonWriter(buffer, ResultJsonHead.Options))
        {
            var contract = report.Contract;
            var decision = contract.Decision;
            w.WriteStartObject();
            ResultJsonHead.Write(w, command, finished: true);
            w.WriteString("outcome", report.Outcome.Token());
            w.WriteString("started_utc", JUnitText.Timestamp(report.StartedUtc));
            w.WriteNumber("elapsed_seconds", Math.Round(report.Elapsed.TotalSeconds, 3));

            ResultJsonHead.WriteContract(w, contract);
            w.WriteStartObject("reference");
            w.WriteString("path", Path.GetFullPath(report.ReferencePath));
            w.WriteString("sha256", report.ReferenceSha256);
            w.WriteNumber("events", report.Reference.Events);
            w.WriteEndObject();
            w.WriteStartObject("sample");
            w.WriteStartArray("files");
            foreach (var f in report.SampleFiles) w.WriteStringValue(Path.GetFullPath(f));
            w.WriteEndArray();
            w.WriteNumber("events", report.Events);
            ResultJsonHead.NumberOrNull(w, "sum_w", report.SumW);
            ResultJsonHead.NumberOrNull(w, "effective_events", report.EffectiveEvents);
            w.WriteEndObject();
            ResultJsonHead.WriteDecision(w, decision);

            w.WriteStartObject("counts");
            w.WriteNumber("checks", report.Outcomes.Count);
            w.WriteNumber("passed", report.Outcomes.Count(o => o.Verdict == Verdict.Pass));
            w.WriteNumber("failed", report.Failures);
            w.WriteNumber("inconclusive", report.Inconclusive);
            w.WriteNumber("uncovered_subjects", report.UncoveredSubjects.Count);
            w.WriteNumber("ledger_errors", report.Acceptance.Count(f => f.IsError));
            w.WriteEndObject();

            w.WriteStartArray("binding_checks");
            foreach (var (o, h) in BindingChecks.Of(report))
            {
                w.WriteStartObject();
                w.WriteString("subject", o.Subject.Name);
                w.WriteString("check", o.Check.Label);
                ResultJsonHead.NumberOrNull(w, "upper_share", h.UpperShare);
                ResultJsonHead.NumberOrNull(w, "point_share", h.PointShare);
                w.WriteEndObject();
            }
            w.WriteEndArray();

            w.WriteStartObject("global_score");
            ResultJsonHead.NumberOrNull(w, "value", report.Score.HasValue ? report.Score.Value : double.NaN);
            ResultJsonHead.NumberOrNull(w, "standard_error", report.Score.HasValue ? report.Score.StandardError : double.NaN);
            if (report.Score.HasValue) w.WriteString("measure", report.Score.Covers); else w.WriteNull("measure");
            if (report.Score.Absence is { } absence) w.WriteString("absence", absence); else w.WriteNull("absence");
            w.WriteEndObject();

            w.WriteStartArray("checks");
            foreach (var o in report.Outcomes) Check(w, o, decision);
            w.WriteEndArray();

            w.WriteStartArray("diagnostics");
            foreach (var r in report.Readings)
            {
                w.WriteStartObject();
                w.WriteString("subject", r.Subject.Name);
                w.WriteString("test", r.Test.Label);
                ResultJsonHead.NumberOrNull(w, "statistic", r.Statistic);
                ResultJsonHead.NumberOrNull(w, "p_value", r.Measured.PValue);
                ResultJsonHead.NumberOrNull(w, "adjusted_p_value", r.AdjustedPValue);
                w.WriteString("reading", r.Finding.Token());
                w.WriteEndObject();
            }
            w.WriteEndArray();

            w.WriteStartArray("uncovered_subjects");
            foreach (var s in report.UncoveredSubjects) w.WriteStringValue(s.Name);
            w.WriteEndArray();

            w.WriteStartArray("ledger");
            foreach (var f in report.Acceptance)
            {
                w.WriteStartObject();
                w.WriteString("code", f.Code);
                w.WriteString("severity", f.IsError ? "error" : "warning");
                w.WriteString("message", f.Message);
                w.WriteEndObject();
            }
            w.WriteEndArray();

            if (command == "accept")
            {
                if (acceptedEntry is { } number) w.WriteNumber("accepted_entry", number); else w.WriteNull("accepted_entry");
                w.WriteString("ledger_path", contract.LedgerFullPath);
            }
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(buffer.ToArray()) + "\n";
    }

    private static void Check(Utf8JsonWriter w, CheckOutcome o, DecisionSettings decision)
    {
        var m = o.Measured;
        var h = Headroom.Of(o, decision);
        w.WriteStartObject();
        w.WriteString("subject", o.Subject.Name);
        w.WriteString("label", SubjectLabel.Of(o.Subject));
        w.WriteString("check", o.Check.Label);
        w.WriteString("kind", o.Check.Key);
        w.WriteString("region", o.Check.RegionName);
        ResultJsonHead.Location(w, "location", o.Check.Location);
        ResultJsonHead.NumberOrNull(w, "estimate", m.Estimate);
        ResultJsonHead.NumberOrNull(w, "lower", m.Lower);
        ResultJsonHead.NumberOrNull(w, "upper", m.Upper);
        ResultJsonHead.NumberOrNull(w, "tolerance", o.Check is ToleranceCheck t ? t.Tolerance : double.NaN);
        w.WriteStartObject("headroom");
        ResultJsonHead.NumberOrNull(w, "upper_share", h.UpperShare);
        ResultJsonHead.NumberOrNull(w, "point_share", h.PointShare);
        w.WriteEndObject();
        ResultJsonHead.NumberOrNull(w, "p_value", m.PValue);
        ResultJsonHead.NumberOrNull(w, "adjusted_p_value", o.AdjustedPValue);
        ResultJsonHead.NumberOrNull(w, "level", o.Level);
        w.WriteString("verdict", ResultTable.VerdictText(o.Verdict).ToLowerInvariant());
        w.WriteString("summary", o.Summary);
        if (o.Verdict == Verdict.Inconclusive && o.Needed is { } n)
        {
            w.WriteStartObject("events_needed");
            ResultJsonHead.NumberOrNull(w, "events", n.Events);
            ResultJsonHead.NumberOrNull(w, "category_events", n.CategoryEvents);
            w.WriteBoolean("reference_limits", n.ReferenceLimits);
            if (n.ReferenceLimits || double.IsNaN(n.Chance)) w.WriteNull("decides"); else w.WriteString("decides", n.Side == DecidingSide.Pass ? "pass" : "fail");
            ResultJsonHead.NumberOrNull(w, "chance", n.Chance);
            w.WriteString("text", UndecidedReason.Of(o));
            w.WriteEndObject();
        }
        else w.WriteNull("events_needed");
        w.WriteEndObject();
    }
}
