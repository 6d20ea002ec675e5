using System.Net;
using System.Text;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// The ranking as one self-contained HTML page: the table in ranked order (with each candidate's global score ± its
/// standard error) and the plot of the score across the candidates in the order given, inline SVG (<see cref="ScorePlot"/>).
/// </summary>
internal static class RankingHtml
{
    public static void Write(string path, RankingReport report) => AtomicFile.WriteText(path, Render(report));

    public static string Render(RankingReport report)
    {
        var sb = new StringBuilder();
        sb.Append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
          .Append("<meta name=\"generator\" content=\"GateTasks ").Append(E(ToolVersion.Current)).Append("\">\n")
          .Append("<title>").Append(E($"Ranking · {report.Contract.DisplayName} · GateTasks")).Append("</title>\n")
          .Append("<style>body{font:14px sans-serif;margin:1.5em;color:#222}table{border-collapse:collapse}th,td{border-bottom:1px solid #ddd;padding:4px 8px;text-align:left}")
          .Append("td.n{text-align:right}.fail{color:#b00020}.undecided{color:#9a6700}.pass{color:#116329}.error{color:#666}</style>\n</head>\n<body>\n");
        sb.Append("<h1>").Append(E(report.Contract.DisplayName)).Append(" — ranking</h1>\n");
        sb.Append("<p>").Append(E(RankingTable.Summary(report))).Append("</p>\n");
        sb.Append("<p>contract <code>").Append(E(Path.GetFullPath(report.Contract.FilePath))).Append("</code>, reference <code>").Append(E(report.ReferencePath)).Append("</code></p>\n");
        sb.Append("<table id=\"ranking\">\n<thead><tr><th>rank</th><th>candidate</th><th>verdict</th><th>failed</th><th>inconclusive</th><th>global score ± SE</th><th>worst margin</th><th>worst check</th><th>why</th></tr></thead>\n<tbody>\n");
        foreach (var c in report.Candidates)
        {
            var r = c.Result;
            var checkedOne = r.Error is null;
            sb.Append("<tr class=\"").Append(c.Status).Append("\"><td class=\"n\">").Append(c.Rank is { } rank ? InvariantNumber.Count(rank) : "—").Append("</td>")
              .Append("<td><code>").Append(E(r.Candidate)).Append("</code></td>")
              .Append("<td class=\"").Append(c.Status).Append("\">").Append(c.Status == "fail" ? "FAIL" : c.Status).Append("</td>")
              .Append("<td class=\"n\">").Append(checkedOne ? InvariantNumber.Count(r.Failed) : "").Append("</td>")
              .Append("<td class=\"n\">").Append(checkedOne ? InvariantNumber.Count(r.Inconclusive) : "").Append("</td>")
              .Append("<td class=\"n global-score\"").Append(r.Score.Absence is { } why ? $" title=\"{E("no global score (" + why + ")")}\"" : "").Append('>')
              .Append(E(checkedOne ? RankingTable.ScoreText(r.Score) : "")).Append("</td>")
              .Append("<td class=\"n\">").Append(E(checkedOne ? RankingTable.MarginText(r.WorstMargin) : "")).Append("</td>")
              .Append("<td>").Append(E(r.Worst?.Label ?? "")).Append("</td>")
              .Append("<td>").Append(E(c.Reason)).Append("</td></tr>\n");
        }
        sb.Append("</tbody>\n</table>\n<p>").Append(E(RankingTable.Rule)).Append("</p>\n");
        sb.Append("<h2>Global score across the candidates, in the order given</h2>\n");
        sb.Append("<p>").Append(E(ScoreCaption(report))).Append("</p>\n");
        sb.Append(ScorePlot.SvgElement(report));
        sb.Append("<footer><p>Written by GateTasks ").Append(E(ToolVersion.Current)).Append(".</p></footer>\n</body>\n</html>\n");
        return sb.ToString();
    }

    /// <summary>What the plot shows, said once for the HTML page and the Markdown summary.</summary>
    public static string ScoreCaption(RankingReport report) =>
        report.Candidates.FirstOrDefault(c => c.Result.Score.HasValue) is { } scored
            ? $"The {scored.Result.Score.Covers} (extrapolated to infinite size; lower is closer to the reference), with ±1 standard-error bars; " +
              "information beside the verdicts, not a verdict. Candidates without a score are marked \"no score\"."
            : "No candidate has a global score (" + (report.Candidates.FirstOrDefault()?.Result.Score.Absence ?? "no candidate") + "); the plot has no point.";

    private static string E(string text) => WebUtility.HtmlEncode(text);
}
