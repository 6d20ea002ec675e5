using System.Text;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// The ranking as CSV (RFC 4180: comma-separated, CRLF line ends, a field holding a comma, quote or line break
/// quoted, quotes doubled), one row per candidate in ranked order. Numbers round-trip with '.' as decimal
/// separator; an impossible measurement's margin is <c>-Infinity</c>; a cell that does not apply is empty.
/// </summary>
internal static class RankingCsv
{
    public static readonly string[] Header =
        ["rank", "candidate", "status", "failed", "inconclusive", "worst_margin", "worst_margin_noise", "worst_feature", "worst_check",
         "decided_by", "tied_with_previous", "reason", "events", "error_code", "global_score", "global_score_standard_error"];

    public static void Write(string path, RankingReport report) => AtomicFile.WriteText(path, Format(report));

    public static string Format(RankingReport report)
    {
        var sb = new StringBuilder();
        AppendRow(sb, Header);
        foreach (var c in report.Candidates)
        {
            var r = c.Result;
            var checkedOne = r.Error is null;
            var worst = r.Worst;
            AppendRow(sb, [
                c.Rank is { } rank ? InvariantNumber.Count(rank) : "",
                r.Candidate,
                c.Status,
                checkedOne ? InvariantNumber.Count(r.Failed) : "",
                checkedOne ? InvariantNumber.Count(r.Inconclusive) : "",
                worst is null ? "" : InvariantNumber.Exact(worst.Margin.Value),
                worst is null || !double.IsFinite(worst.Margin.Noise) ? "" : InvariantNumber.Exact(worst.Margin.Noise),
                worst?.Feature ?? "",
                worst?.Check ?? "",
                c.DecidedByKey,
                c.TiedWithPrevious ? "true" : "false",
                c.Reason,
                checkedOne ? InvariantNumber.Count(r.Events) : "",
                r.Error?.Code ?? "",
                r.Score.HasValue ? InvariantNumber.Exact(r.Score.Value) : "",
                r.Score.HasValue ? InvariantNumber.Exact(r.Score.StandardError) : "",
            ]);
        }
        return sb.ToString();
    }

    private static void AppendRow(StringBuilder sb, IEnumerable<string> fields)
    {
        sb.Append(string.Join(",", fields.Select(Field)));
        sb.Append("\r\n");
    }

    /// <summary>RFC 4180 §2: a field with a comma, a double quote, CR or LF is enclosed in quotes, quotes doubled.</summary>
    public static string Field(string value) =>
        value.AsSpan().IndexOfAny(",\"\r\n") < 0 ? value : "\"" + value.Replace("\"", "\"\"", StringComparison.Ordinal) + "\"";
}
