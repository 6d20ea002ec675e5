using System.Text;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using GateTasks.Engine.Reports;

namespace GateTasks.Engine.Ranking;

/// <summary>
/// The ranking as Markdown (a pull-request comment, a CI job summary): the table in ranked order with each candidate's
/// global score ± its standard error, and the plot of the score across the candidates in the order given, written
/// as an SVG file beside the Markdown (<see cref="PlotPath"/>) and linked from it as an image, since Markdown
/// renderers commonly strip inline SVG.
/// </summary>
internal static class RankingMarkdown
{
    /// <summary>The plot's file beside <paramref name="markdownPath"/>: <c>ranking.md</c> → <c>ranking.score.svg</c>.</summary>
    public static string PlotPath(string markdownPath) =>
        Path.Combine(Path.GetDirectoryName(Path.GetFullPath(markdownPath))!, Path.GetFileNameWithoutExtension(markdownPath) + ".score.svg");

    /// <summary>Writes the plot, then the Markdown that links it (so the link never points at a missing or stale file).</summary>
    public static void Write(string markdownPath, RankingReport report)
    {
        var plot = PlotPath(markdownPath);
        AtomicFile.WriteText(plot, ScorePlot.SvgDocument(report));
        AtomicFile.WriteText(markdownPath, Render(report, Path.GetFileName(plot)));
    }

    public static string Render(RankingReport report, string plotFile)
    {
        var sb = new StringBuilder();
        sb.Append("### GateTasks ranking: ").Append(MarkdownText.Escape(report.Contract.DisplayName)).Append("\n\n");
        sb.Append(MarkdownText.Escape(RankingTable.Summary(report))).Append("\n\n");
        sb.Append("| rank | candidate | verdict | failed | inconclusive | global score ± SE | worst margin | why |\n");
        sb.Append("|---:|---|---|---:|---:|---:|---:|---|\n");
        foreach (var c in report.Candidates)
        {
            var r = c.Result;
            var checkedOne = r.Error is null;
            sb.Append("| ").Append(c.Rank is { } rank ? InvariantNumber.Count(rank) : "—")
              .Append(" | ").Append(MarkdownText.Escape(r.Candidate))
              .Append(" | ").Append(c.Status == "fail" ? "**FAIL**" : c.Status)
              .Append(" | ").Append(checkedOne ? InvariantNumber.Count(r.Failed) : "")
              .Append(" | ").Append(checkedOne ? InvariantNumber.Count(r.Inconclusive) : "")
              .Append(" | ").Append(checkedOne ? MarkdownText.Escape(RankingTable.ScoreText(r.Score)) : "")
              .Append(" | ").Append(checkedOne ? MarkdownText.Escape(RankingTable.MarginText(r.WorstMargin)) : "")
              .Append(" | ").Append(MarkdownText.Escape(c.Reason)).Append(" |\n");
        }
        sb.Append('\n').Append(MarkdownText.Escape(RankingTable.Rule)).Append("\n\n");
        sb.Append("#### Global score across the candidates, in the order given\n\n");
        sb.Append(MarkdownText.Escape(RankingHtml.ScoreCaption(report))).Append("\n\n");
        sb.Append("![global score ± standard error per candidate](").Append(Uri.EscapeDataString(plotFile)).Append(")\n");
        return sb.ToString();
    }
}
