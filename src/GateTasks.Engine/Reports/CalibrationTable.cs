using System.Globalization;
using System.Text;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Reports;

/// <summary>
/// The calibration study as Markdown tables (readable as plain text too): the contract's rates per row, then every
/// check's own rates on the null rows.
/// </summary>
internal static class CalibrationTable
{
    public static string Format(PrecisionContract contract, IReadOnlyList<CalibrationResult> results)
    {
        var sb = new StringBuilder();
        var d = contract.Decision;
        var checks = contract.Features.Sum(f => f.Checks.Count);
        var pairChecks = contract.Pairs.Sum(p => p.Checks.Count());
        // The joint block's checks are not replicated: listed as not calibrated.
        var notCalibrated = contract.Joint is { } j ? j.Checks.OfType<ToleranceCheck>().Select(c => $"{c.Label} of {j.Name}").ToList() : [];
        sb.AppendLine($"Contract {contract.DisplayName}: {checks + pairChecks} checks replicated ({checks} per feature, {pairChecks} on pairs), " +
                      $"false-alarm level {InvariantNumber.Short(d.FalseAlarm)} ({d.CorrectionName}), confidence {InvariantNumber.Short(d.Confidence)}.");
        if (notCalibrated.Count > 0)
            sb.AppendLine($"Not calibrated (a reference keeps no rows to draw the joint law from; the rates below leave them out): {string.Join(", ", notCalibrated)}.");
        sb.AppendLine();
        sb.AppendLine("| drift | feature | surrogate weights | surrogate events | replicas | contract failed | rate [95% CI] | inconclusive |");
        sb.AppendLine("|---|---|---|---:|---:|---:|---|---:|");
        foreach (var r in results)
        {
            var (lo, hi) = r.FailRateInterval;
            sb.AppendLine($"| {r.Drift.Label} | {r.Feature ?? "—"} | {r.Weights.Label} | {InvariantNumber.Count(r.Events)} | {r.Replicas} | {r.Failed} | " +
                          $"{Pct(r.FailRate)} [{Pct(lo)}, {Pct(hi)}] | {Pct(r.InconclusiveRate)} |");
        }
        var nulls = results.Where(r => r.Drift.Kind == DriftKind.None && r.Checks.Count > 0).ToList();
        if (nulls.Count == 0) return sb.ToString();
        sb.AppendLine();
        sb.AppendLine("Each check on the null replicas: how often it failed after the contract-wide correction, and for a goodness-of-fit test how often");
        sb.AppendLine($"its own p-value was at most {InvariantNumber.Short(d.FalseAlarm)} (\"significant\"), with 95% Clopper–Pearson intervals.");
        sb.AppendLine();
        sb.AppendLine("| subject | check | surrogate weights | surrogate events | failed | fail rate [95% CI] | inconclusive | significant rate [95% CI] |");
        sb.AppendLine("|---|---|---|---:|---:|---|---:|---|");
        foreach (var r in nulls)
            foreach (var c in r.Checks)
            {
                var (lo, hi) = c.FailRateInterval;
                var (slo, shi) = c.SignificantRateInterval;
                var significant = c.IsTest ? $"{Pct(c.SignificantRate)} [{Pct(slo)}, {Pct(shi)}]" : "—";
                sb.AppendLine($"| {c.Subject} | {c.Check} | {r.Weights.Label} | {InvariantNumber.Count(r.Events)} | {c.Failed} | " +
                              $"{Pct(c.FailRate)} [{Pct(lo)}, {Pct(hi)}] | {Pct((double)c.Inconclusive / c.Replicas)} | {significant} |");
            }
        return sb.ToString();
    }

    /// <summary>True when every null row's false-alarm rate is consistent with at most the contract's level (its interval reaches down to it).</summary>
    public static bool NullWithinLevel(PrecisionContract contract, IEnumerable<CalibrationResult> results) =>
        results.Where(r => r.Drift.Kind == DriftKind.None).All(r => r.FailRateInterval.Lower <= contract.Decision.FalseAlarm);

    private static string Pct(double x) => double.IsNaN(x) ? "—" : (x * 100).ToString("0.0", CultureInfo.InvariantCulture) + "%";
}
