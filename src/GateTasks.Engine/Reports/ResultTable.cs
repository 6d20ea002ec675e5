using System.Globalization;
using System.Text;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Reports;

/// <summary>The plain-text table of a check run: one row per feature × check × region. No colour codes, so it reads the same in logs and reports.</summary>
internal static class ResultTable
{
    private static readonly string[] Header = ["feature", "check", "region", "measured", "tolerance", "margin", "verdict"];

    public static string Format(CheckReport report)
    {
        var rows = new List<string[]> { Header };
        foreach (var o in report.Outcomes)
        {
            rows.Add([
                o.Feature.Name,
                o.Check.Key,
                o.Check.RegionName,
                InvariantNumber.Short(o.Value),
                (o.Check.LimitIsMaximum ? "≤ " : "≥ ") + InvariantNumber.Short(o.Check.Limit),
                Margin(o),
                o.Verdict == Verdict.Pass ? "pass" : "FAIL",
            ]);
        }
        var widths = Enumerable.Range(0, Header.Length).Select(c => rows.Max(r => r[c].Length)).ToArray();
        var sb = new StringBuilder();
        for (var i = 0; i < rows.Count; i++)
        {
            sb.AppendLine(string.Join("  ", rows[i].Select((cell, c) => c is 3 or 4 or 5 ? cell.PadLeft(widths[c]) : cell.PadRight(widths[c]))).TrimEnd());
            if (i == 0) sb.AppendLine(string.Join("  ", widths.Select(w => new string('-', w))));
        }
        return sb.ToString();
    }

    /// <summary>
    /// Headroom as people read it: for an upper bound, the share of the tolerance left (negative: exceeded);
    /// for a p-value floor, how many times the floor the p-value is (a percentage of a floor means little).
    /// </summary>
    private static string Margin(CheckOutcome o)
    {
        if (double.IsNaN(o.Margin)) return "n/a";
        if (!o.Check.LimitIsMaximum) return "×" + InvariantNumber.Short(o.Value / o.Check.Limit);
        return (o.RelativeMargin >= 0 ? "+" : "") + (o.RelativeMargin * 100).ToString("0.#", CultureInfo.InvariantCulture) + "%";
    }

    /// <summary>One line saying what was checked and how it went.</summary>
    public static string Summary(CheckReport report)
    {
        var verdict = report.Passed ? "PASSED" : "FAILED";
        return $"{verdict}: {report.Outcomes.Count - report.Failures} of {report.Outcomes.Count} checks within tolerance " +
               $"({report.Contract.Features.Count} features, {InvariantNumber.Count(report.Events)} surrogate events, " +
               $"effective {report.EffectiveEvents.ToString("0", CultureInfo.InvariantCulture)}; reference {InvariantNumber.Count(report.Reference.Events)} events).";
    }
}
