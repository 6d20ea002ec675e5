using System.Text.Json;
using GateTasks.Engine.Checks;
using GateTasks.Engine.IO;
using GateTasks.Engine.Reports;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// The ranking as JSON, the <c>rank</c> document of the result family (docs/result-json.md, with the same head as
/// every result: schema version, command, tool version): the contract and its decision settings, then every candidate
/// in ranked order with its counts, worst margin and check, the key that placed it, and each check's margin and
/// headroom (<see cref="Headroom.FromMargin"/>). A number that is not finite (an impossible measurement, −∞) is
/// <c>null</c>, as JSON has no infinities.
/// </summary>
internal static class RankingJson
{
    public static void Write(string path, RankingReport report) => AtomicFile.Write(path, s => Write(s, report));

    public static void Write(Stream stream, RankingReport report)
    {
        using var w = new Utf8JsonWriter(stream, ResultJsonHead.Options);
        var contract = report.Contract;
        var d = contract.Decision;
        w.WriteStartObject();
        ResultJsonHead.Write(w, "rank", finished: true);
        w.WriteString("contract", Path.GetFullPath(contract.FilePath));
        w.WriteString("title", contract.DisplayName);
        w.WriteString("reference", report.ReferencePath);
        ResultJsonHead.WriteDecision(w, d);
        w.WriteBoolean("any_passed", report.AnyPassed);
        w.WriteStartArray("candidates");
        foreach (var c in report.Candidates) WriteCandidate(w, c, d.Confidence);
        w.WriteEndArray();
        w.WriteEndObject();
    }

    private static void WriteCandidate(Utf8JsonWriter w, RankedCandidate c, double confidence)
    {
        var r = c.Result;
        w.WriteStartObject();
        if (c.Rank is { } rank) w.WriteNumber("rank", rank); else w.WriteNull("rank");
        w.WriteString("candidate", r.Candidate);
        w.WriteNumber("given", c.Given);
        w.WriteString("status", c.Status);
        w.WriteStartArray("files");
        foreach (var f in r.SampleFiles) w.WriteStringValue(f);
        w.WriteEndArray();
        if (r.Error is null)
        {
            w.WriteNumber("events", r.Events);
            w.WriteNumber("failed", r.Failed);
            w.WriteNumber("inconclusive", r.Inconclusive);
        }
        else
        {
            w.WriteNull("events");
            w.WriteNull("failed");
            w.WriteNull("inconclusive");
        }
        var worst = r.Worst;
        WriteNumberOrNull(w, "worst_margin", worst?.Margin.Value ?? double.NaN);
        WriteNumberOrNull(w, "worst_margin_noise", worst?.Margin.Noise ?? double.NaN);
        if (worst is null) w.WriteNull("worst_check");
        else
        {
            w.WriteStartObject("worst_check");
            w.WriteString("feature", worst.Feature);
            w.WriteString("check", worst.Check);
            w.WriteString("verdict", VerdictKey(worst.Verdict));
            w.WriteEndObject();
        }
        // The global score: null with the reason when there is none, never a zero.
        WriteNumberOrNull(w, "global_score", r.Score.Value);
        WriteNumberOrNull(w, "global_score_standard_error", r.Score.StandardError);
        if (r.Score.HasValue) w.WriteString("global_score_measure", r.Score.Covers); else w.WriteNull("global_score_measure");
        if (r.Score.Absence is { } absence) w.WriteString("global_score_absence", absence); else w.WriteNull("global_score_absence");
        w.WriteString("decided_by", c.DecidedByKey);
        w.WriteBoolean("tied_with_previous", c.TiedWithPrevious);
        w.WriteString("reason", c.Reason);
        if (r.Error is { } e)
        {
            w.WriteStartObject("error");
            w.WriteString("code", e.Code);
            w.WriteString("message", e.Message);
            if (e.Location is { } at) w.WriteString("location", at.ToString()); else w.WriteNull("location");
            w.WriteEndObject();
        }
        else w.WriteNull("error");
        w.WriteStartArray("checks");
        foreach (var check in r.Checks)
        {
            w.WriteStartObject();
            w.WriteString("feature", check.Feature);
            w.WriteString("check", check.Check);
            w.WriteString("verdict", VerdictKey(check.Verdict));
            WriteNumberOrNull(w, "margin", check.Margin.Value);
            WriteNumberOrNull(w, "margin_noise", check.Margin.Noise);
            var headroom = Headroom.FromMargin(check.Margin, confidence);
            w.WriteStartObject("headroom");
            WriteNumberOrNull(w, "upper_share", headroom.UpperShare);
            WriteNumberOrNull(w, "point_share", headroom.PointShare);
            w.WriteEndObject();
            w.WriteEndObject();
        }
        w.WriteEndArray();
        w.WriteEndObject();
    }

    private static void WriteNumberOrNull(Utf8JsonWriter w, string name, double value)
    {
        if (double.IsFinite(value)) w.WriteNumber(name, value);
        else w.WriteNull(name);
    }

    private static string VerdictKey(Verdict v) => v switch
    {
        Verdict.Pass => "pass",
        Verdict.Fail => "fail",
        _ => "inconclusive",
    };
}
