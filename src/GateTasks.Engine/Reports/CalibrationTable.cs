using System.Globalization;
using System.Text;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Reports;

/// <summary>The calibration study as a Markdown table (readable as plain text too).</summary>
internal static class CalibrationTable
{
    public static string Format(PrecisionContract contract, IReadOnlyList<CalibrationResult> results)
    {
        var sb = new StringBuilder();
        var d = contract.Decision;
        sb.AppendLine($"Contract {contract.DisplayName}: {contract.Features.Sum(f => f.Checks.Count)} checks, false-alarm level {InvariantNumber.Short(d.FalseAlarm)} ({d.CorrectionName}), confidence {InvariantNumber.Short(d.Confidence)}.");
        sb.AppendLine();
        sb.AppendLine("| drift | feature | surrogate events | replicas | contract failed | rate [95% CI] | inconclusive |");
        sb.AppendLine("|---|---|---:|---:|---:|---|---:|");
        foreach (var r in results)
        {
            var (lo, hi) = r.FailRateInterval;
            sb.AppendLine($"| {r.Drift.Label} | {r.Feature ?? "—"} | {InvariantNumber.Count(r.Events)} | {r.Replicas} | {r.Failed} | " +
                          $"{Pct(r.FailRate)} [{Pct(lo)}, {Pct(hi)}] | {Pct(r.InconclusiveRate)} |");
        }
        return sb.ToString();
    }

    /// <summary>True when every null row's false-alarm rate is consistent with at most the contract's level (its interval reaches down to it).</summary>
    public static bool NullWithinLevel(PrecisionContract contract, IEnumerable<CalibrationResult> results) =>
        results.Where(r => r.Drift.Kind == DriftKind.None).All(r => r.FailRateInterval.Lower <= contract.Decision.FalseAlarm);

    private static string Pct(double x) => double.IsNaN(x) ? "—" : (x * 100).ToString("0.0", CultureInfo.InvariantCulture) + "%";
}
