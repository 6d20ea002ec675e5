using System.Text;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Ranking;

/// <summary>The plain-text ranking table: one row per candidate, best first, with the reason for its place.</summary>
internal static class RankingTable
{
    public static string Format(RankingReport report)
    {
        string[] header = ["rank", "candidate", "verdict", "failed", "inconclusive", "global score", "worst margin", "worst check", "why"];
        var rows = new List<string[]> { header };
        foreach (var c in report.Candidates)
        {
            var r = c.Result;
            rows.Add(r.Error is not null
                ? ["—", r.Candidate, "error", "", "", "", "", "", c.Reason]
                : [InvariantNumber.Count(c.Rank!.Value), r.Candidate, c.Status == "fail" ? "FAIL" : c.Status, InvariantNumber.Count(r.Failed),
                   InvariantNumber.Count(r.Inconclusive), ScoreText(r.Score), MarginText(r.WorstMargin), r.Worst?.Label ?? "—", c.Reason]);
        }
        var widths = Enumerable.Range(0, header.Length).Select(col => rows.Max(row => row[col].Length)).ToArray();
        var sb = new StringBuilder();
        for (var i = 0; i < rows.Count; i++)
        {
            sb.AppendLine(string.Join("  ", rows[i].Select((cell, col) => col is 3 or 4 or 5 or 6 ? cell.PadLeft(widths[col]) : cell.PadRight(widths[col]))).TrimEnd());
            if (i == 0) sb.AppendLine(string.Join("  ", widths.Select(w => new string('-', w))));
        }
        sb.AppendLine(Rule);
        if (report.Candidates.FirstOrDefault(c => c.Result.Score.HasValue) is { } scored)
            sb.AppendLine($"Global score: the {scored.Result.Score.Covers}, extrapolated to infinite size, ± its standard error; information, not a verdict.");
        else
            sb.AppendLine("No candidate has a global score" + (report.Candidates.FirstOrDefault(c => c.Result.Error is null) is { } any ? $" ({any.Result.Score.Absence})." : "."));
        return sb.ToString();
    }

    /// <summary>The ranking rule in words, as every ranking output states it.</summary>
    public const string Rule =
        "Ranked by failed checks, then inconclusive checks (fewer first), then the global score (lower first; candidates without one " +
        "after those with one), then the worst margin over all checks (1 − upper bound/tolerance; tests 1 − level/adjusted p; higher first). " +
        "Global scores, or worst margins, apart by no more than their noise (±1σ) tie, and tied candidates share a rank.";

    /// <summary>"0.0123 ± 0.0045", or "none" without a global score.</summary>
    public static string ScoreText(GlobalScore s) =>
        s.HasValue ? $"{InvariantNumber.Short(s.Value)} ± {InvariantNumber.Short(s.StandardError)}" : "none";

    /// <summary>One line: the best candidate and whether it passes, and how many could not be checked.</summary>
    public static string Summary(RankingReport report)
    {
        var best = report.Candidates.FirstOrDefault(c => c.Rank is not null);
        var tiedAtTop = report.Candidates.Where(c => c.Rank == 1).Select(c => c.Result.Candidate).ToList();
        var passing = report.Candidates.Count(c => c.Result.Passed);
        var line = best is null ? "No candidate could be checked."
            : passing == 0 ? $"No candidate passes the contract; best: {string.Join(", ", tiedAtTop)}."
            : $"{passing} of {report.Candidates.Count} candidates pass the contract; best: {string.Join(", ", tiedAtTop)}{(tiedAtTop.Count > 1 ? " (tied)" : "")}.";
        var notChecked = report.NotChecked.Count;
        return notChecked == 0 ? line : line + $" {notChecked} could not be checked.";
    }

    /// <summary>"0.4123 ± 0.03", "-inf" (a measurement was impossible), "—" (no check).</summary>
    public static string MarginText(Margin m) =>
        double.IsPositiveInfinity(m.Value) ? "—"
        : double.IsFinite(m.Value) && double.IsFinite(m.Noise) ? $"{InvariantNumber.Short(m.Value)} ± {InvariantNumber.Short(m.Noise)}"
        : InvariantNumber.Short(m.Value);
}
