using System.Globalization;
using System.Text;
using System.Xml;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Reports;

/// <summary>
/// Writes a check run as JUnit-style XML, the common subset CI systems read: one flat testsuite per contract,
/// one testcase per feature × check × region, a failure element stating measured against tolerance, and
/// properties carrying the numbers. Goodness-of-fit tests are diagnostics, not test cases: each is a suite property
/// (<c>gatetasks.diagnostic.…</c>) and a line of the suite's output, so it can neither fail nor add a pass. A subject
/// covered only by such tests is a test case of its own that does not pass (failed under <c>inconclusive: fail</c>,
/// else skipped). Written atomically.
/// </summary>
internal static class JUnitReport
{
    public static void Write(string path, IReadOnlyList<RunResult> reports) =>
        AtomicFile.WriteText(path, Render(reports));

    public static string Render(IReadOnlyList<RunResult> reports)
    {
        var settings = new XmlWriterSettings { Indent = true, Encoding = new UTF8Encoding(false), CheckCharacters = true };
        var sb = new StringBuilder();
        using (var w = XmlWriter.Create(new StringWriterUtf8(sb), settings))
        {
            w.WriteStartDocument();
            w.WriteStartElement("testsuites");
            w.WriteAttributeString("name", "gatetasks");
            w.WriteAttributeString("tests", Count(reports.Sum(Cases)));
            w.WriteAttributeString("failures", Count(reports.Sum(Failed)));
            w.WriteAttributeString("errors", "0");
            w.WriteAttributeString("skipped", Count(reports.Sum(Skipped)));
            w.WriteAttributeString("time", Seconds(reports.Sum(r => r.Elapsed.TotalSeconds)));
            if (reports.Count > 0) w.WriteAttributeString("timestamp", Timestamp(reports[0].StartedUtc));
            foreach (var report in reports) WriteSuite(w, report);
            w.WriteEndElement();
            w.WriteEndDocument();
        }
        return sb.ToString();
    }

    private static void WriteSuite(XmlWriter w, RunResult r)
    {
        var suite = Clean(r.Contract.DisplayName);
        var contractPath = r.Contract.FilePath;
        w.WriteStartElement("testsuite");
        w.WriteAttributeString("name", suite);
        w.WriteAttributeString("tests", Count(Cases(r)));
        w.WriteAttributeString("failures", Count(Failed(r)));
        w.WriteAttributeString("errors", "0");
        w.WriteAttributeString("skipped", Count(Skipped(r)));
        w.WriteAttributeString("time", Seconds(r.Elapsed.TotalSeconds));
        w.WriteAttributeString("timestamp", Timestamp(r.StartedUtc));
        w.WriteAttributeString("file", Clean(contractPath));

        w.WriteStartElement("properties");
        Property(w, "gatetasks.outcome", r.Outcome.Token());
        Property(w, "gatetasks.contract", contractPath);
        Property(w, "gatetasks.reference", r.ReferencePath);
        Property(w, "gatetasks.reference.sha256", r.ReferenceSha256);
        Property(w, "gatetasks.reference.events", InvariantNumber.Count(r.Reference.Events));
        Property(w, "gatetasks.sample.files", string.Join(";", r.SampleFiles));
        Property(w, "gatetasks.sample.events", InvariantNumber.Count(r.Events));
        Property(w, "gatetasks.sample.sum_w", InvariantNumber.Exact(r.SumW));
        Property(w, "gatetasks.sample.effective_events", InvariantNumber.Exact(r.EffectiveEvents));
        Property(w, "gatetasks.decision.confidence", InvariantNumber.Exact(r.Contract.Decision.Confidence));
        Property(w, "gatetasks.decision.false_alarm", InvariantNumber.Exact(r.Contract.Decision.FalseAlarm));
        Property(w, "gatetasks.decision.correction", r.Contract.Decision.CorrectionName);
        Property(w, "gatetasks.decision.inconclusive", r.Contract.Decision.InconclusiveFails ? "fail" : "warn");
        // The global score: a number for comparing candidates, never a verdict; "none" with the reason when absent.
        if (r.Score.HasValue)
        {
            Property(w, "gatetasks.global_score", InvariantNumber.Exact(r.Score.Value));
            Property(w, "gatetasks.global_score.standard_error", InvariantNumber.Exact(r.Score.StandardError));
            Property(w, "gatetasks.global_score.measure", r.Score.Covers);
        }
        else
        {
            Property(w, "gatetasks.global_score", "none");
            Property(w, "gatetasks.global_score.reason", r.Score.Absence!);
        }
        foreach (var reading in r.Readings)
        {
            var key = $"gatetasks.diagnostic.{reading.Subject.Name}.{reading.Test.Label}";
            Property(w, key, reading.Finding.Token());
            Property(w, key + ".statistic", InvariantNumber.Exact(reading.Statistic));
            Property(w, key + ".p_value", InvariantNumber.Exact(reading.Measured.PValue));
            Property(w, key + ".adjusted_p_value", InvariantNumber.Exact(reading.AdjustedPValue));
        }
        w.WriteEndElement();

        var caseTime = r.Outcomes.Count > 0 ? r.Elapsed.TotalSeconds / r.Outcomes.Count : 0;
        foreach (var o in r.Outcomes)
        {
            var where = o.Check.Location;
            w.WriteStartElement("testcase");
            w.WriteAttributeString("classname", Clean($"{suite}.{o.Subject.Name}"));
            w.WriteAttributeString("name", Clean(o.Check.Label));
            w.WriteAttributeString("time", Seconds(caseTime));
            w.WriteAttributeString("file", Clean(where.File));
            if (where.Line > 0) w.WriteAttributeString("line", Count(where.Line));

            var m = o.Measured;
            w.WriteStartElement("properties");
            Property(w, "feature", o.Subject.Name);
            Property(w, "check", o.Check.Key);
            Property(w, "region", o.Check.RegionName);
            Property(w, "estimate", InvariantNumber.Exact(m.Estimate));
            if (o.Check is ToleranceCheck bounded)
            {
                Property(w, "lower_bound", InvariantNumber.Exact(m.Lower));
                Property(w, "upper_bound", InvariantNumber.Exact(m.Upper));
                Property(w, "tolerance", InvariantNumber.Exact(bounded.Tolerance));
            }
            Property(w, "p_value", InvariantNumber.Exact(m.PValue));
            Property(w, "adjusted_p_value", InvariantNumber.Exact(o.AdjustedPValue));
            Property(w, "level", InvariantNumber.Exact(o.Level));
            Property(w, "verdict", ResultTable.VerdictText(o.Verdict).ToLowerInvariant());
            // The share of the tolerance used (docs/reports.md): "inf" when the measurement could not be made, "NaN" without a point share.
            var headroom = Headroom.Of(o, r.Contract.Decision);
            Property(w, "headroom_upper_share", InvariantNumber.Exact(headroom.UpperShare));
            Property(w, "headroom_point_share", InvariantNumber.Exact(headroom.PointShare));
            Property(w, "headroom", HeadroomText.Of(headroom));
            if (o.Needed is { } needed)
            {
                Property(w, "events_needed", InvariantNumber.Exact(needed.Events));
                if (!double.IsNaN(needed.CategoryEvents)) Property(w, "events_needed_in_category", InvariantNumber.Exact(needed.CategoryEvents));
                if (!needed.ReferenceLimits && !double.IsNaN(needed.Chance))
                {
                    Property(w, "events_needed_decides", needed.Side == DecidingSide.Pass ? "pass" : "fail");
                    Property(w, "events_needed_chance", InvariantNumber.Exact(needed.Chance));
                }
            }
            foreach (var (k, v) in o.Details) Property(w, k, v);
            w.WriteEndElement();

            var counted = o.Verdict == Verdict.Fail || (o.Verdict == Verdict.Inconclusive && r.Contract.Decision.InconclusiveFails);
            if (counted)
            {
                var code = o.Verdict == Verdict.Fail ? CheckEvaluator.DriftCode(o.Check) : CheckEvaluator.InconclusiveCode;
                // The same sentence as the console's coded message and the HTML report's.
                var sentence = CheckSentence.Of(o, r.Contract.Decision);
                w.WriteStartElement("failure");
                w.WriteAttributeString("message", Clean(sentence));
                w.WriteAttributeString("type", code);
                w.WriteString(Clean(
                    Diagnostic.Error(code, sentence, where).Line + "\n" +
                    $"adjusted p-value {InvariantNumber.Exact(o.AdjustedPValue)} against the family-wise level {InvariantNumber.Exact(r.Contract.Decision.FalseAlarm)} ({r.Contract.Decision.CorrectionName})\n" +
                    $"tolerance stated at {where}"));
                w.WriteEndElement();
            }
            else if (o.Verdict == Verdict.Inconclusive)
            {
                w.WriteStartElement("skipped");
                w.WriteAttributeString("message", Clean($"{o.Subject.Name} {o.Check.Label}: inconclusive, {(m.Uncomputable ? o.Summary : UndecidedReason.Of(o))}"));
                w.WriteEndElement();
            }
            w.WriteEndElement();
        }

        // A subject that only tests cover is not shown within any tolerance: a case that does not pass, never a green one.
        foreach (var subject in r.UncoveredSubjects)
        {
            w.WriteStartElement("testcase");
            w.WriteAttributeString("classname", Clean($"{suite}.{subject.Name}"));
            w.WriteAttributeString("name", "tolerance coverage");
            w.WriteAttributeString("time", Seconds(0));
            w.WriteAttributeString("file", Clean(subject.Location.File));
            if (subject.Location.Line > 0) w.WriteAttributeString("line", Count(subject.Location.Line));
            var text = RunDiagnostics.UncoveredText(subject);
            if (r.Contract.Decision.InconclusiveFails)
            {
                w.WriteStartElement("failure");
                w.WriteAttributeString("message", Clean($"{subject.Name}: {text}"));
                w.WriteAttributeString("type", ErrorCodes.SubjectWithoutTolerance);
                w.WriteString(Clean(Diagnostic.Error(ErrorCodes.SubjectWithoutTolerance, text, subject.Location).Line + "\n" +
                    $"declared at {subject.Location}"));
                w.WriteEndElement();
            }
            else
            {
                w.WriteStartElement("skipped");
                w.WriteAttributeString("message", Clean($"{subject.Name}: {text}"));
                w.WriteEndElement();
            }
            w.WriteEndElement();
        }

        // The ledger's findings are test cases too, so a run whose tolerances were changed unseen never reads as green.
        for (var i = 0; i < r.Acceptance.Count; i++)
        {
            var f = r.Acceptance[i];
            w.WriteStartElement("testcase");
            w.WriteAttributeString("classname", Clean($"{suite}.acceptance"));
            w.WriteAttributeString("name", Clean($"ledger {i + 1}: {f.Code}"));
            w.WriteAttributeString("time", Seconds(0));
            if (f.Location is { } at)
            {
                w.WriteAttributeString("file", Clean(at.File));
                if (at.Line > 0) w.WriteAttributeString("line", Count(at.Line));
            }
            if (f.IsError)
            {
                w.WriteStartElement("failure");
                w.WriteAttributeString("message", Clean(f.Message));
                w.WriteAttributeString("type", f.Code);
                w.WriteString(Clean(f.Diagnostic.Line));
                w.WriteEndElement();
            }
            else
            {
                w.WriteStartElement("system-out");
                w.WriteString(Clean(f.Diagnostic.Line));
                w.WriteEndElement();
            }
            w.WriteEndElement();
        }

        w.WriteStartElement("system-out");
        w.WriteString(Clean(ResultTable.Format(r) + ResultTable.Summary(r) + "\n"));
        w.WriteEndElement();
        w.WriteEndElement();
    }

    private static int Cases(RunResult r) => r.Outcomes.Count + r.UncoveredSubjects.Count + r.Acceptance.Count;

    private static int Failed(RunResult r) =>
        r.Failures + (r.Contract.Decision.InconclusiveFails ? r.Inconclusive + r.UncoveredSubjects.Count : 0) + r.Acceptance.Count(f => f.IsError);

    private static int Skipped(RunResult r) => r.Contract.Decision.InconclusiveFails ? 0 : r.Inconclusive + r.UncoveredSubjects.Count;

    private static void Property(XmlWriter w, string name, string value)
    {
        w.WriteStartElement("property");
        w.WriteAttributeString("name", Clean(name));
        w.WriteAttributeString("value", Clean(value));
        w.WriteEndElement();
    }

    /// <summary>See <see cref="JUnitText.Clean"/>.</summary>
    internal static string Clean(string text) => JUnitText.Clean(text);

    private static string Count(long n) => n.ToString(CultureInfo.InvariantCulture);

    private static string Seconds(double s) => s.ToString("0.000", CultureInfo.InvariantCulture);

    internal static string Timestamp(DateTimeOffset t) => JUnitText.Timestamp(t);
}
