using System.Globalization;
using System.Text;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Planning;

namespace GateTasks.Engine.Reports;

/// <summary>A sample-size plan as a Markdown table (readable as plain text too), with the whole contract's size below it.</summary>
internal static class PlanTable
{
    public static string Format(PrecisionContract contract, SampleSizePlan plan)
    {
        var sb = new StringBuilder();
        var d = contract.Decision;
        sb.AppendLine($"Contract {contract.DisplayName}: {plan.Checks.Count} checks simulated from the reference ({InvariantNumber.Count(plan.ReferenceEvents)} effective events), " +
                      $"{plan.Replicas} replicas per point; confidence {Short(d.Confidence)}, false-alarm level {Short(d.FalseAlarm)} ({d.CorrectionName}).");
        sb.AppendLine();
        sb.AppendLine($"| subject | check | tolerance | events to pass | pass rate there | drift family | detectable at {Approximately(plan.DetectionEvents)} events | its effect |");
        sb.AppendLine("|---|---|---:|---:|---|---|---:|---:|");
        foreach (var c in plan.Checks)
        {
            var events = c.EventsToPass is { } n ? Approximately(n) : "never: reference-limited";
            var detectable = c.Family is null ? "not simulated"
                : c.DetectableDrift is { } s ? Percent(s) : $"none up to {Percent(c.DriftSearchedUpTo)}";
            sb.AppendLine($"| {c.Subject.Name} | {c.Check.Label} | {(c.Check is ToleranceCheck bounded ? Short(bounded.Tolerance) : "test")} | {events} | " +
                          $"{Short(c.PassRate)} ± {Noise(c.PassRateNoise)} | {FamilyName(c.Family)} | {detectable} | {(c.EffectAtDrift is { } e ? Short(e) : "—")} |");
        }
        sb.AppendLine();
        if (plan.ContractEvents is { } total)
            sb.AppendLine($"Whole contract: a perfect surrogate passes every check with probability ≥ {Short(plan.Target)} from {Approximately(total)} events " +
                          $"(simulated there: {Short(plan.ContractPassRate)} ± {Noise(plan.ContractPassRateNoise)}).");
        else
        {
            var limited = plan.Checks.Count(c => c.EventsToPass is null);
            sb.AppendLine(limited > 0
                ? $"Whole contract: no surrogate size up to {InvariantNumber.Count(PlanStudy.LargestEvents)} events passes it reliably: {limited} check(s) are limited by the reference's own noise. A larger reference, fewer bins or looser tolerances are needed."
                : $"Whole contract: no size within two octaves of the checks' own sizes passed every check at the rate {Short(plan.Target)} (last simulated: {Short(plan.ContractPassRate)}).");
        }
        sb.AppendLine($"Detectable drift: the smallest drift of the check's family that fails the check with probability ≥ {Short(plan.Power)} at {Approximately(plan.DetectionEvents)} surrogate events " +
                      "(scale shift: values × (1 + s); tail deficit: tail bins thinned by s; width increase: spread about the mean × (1 + s); spike-share shift: the spike or top category loses s of the events; correlation change: the pair's coefficient moved by s towards zero); its effect is the check's estimate for that drift without noise.");
        sb.AppendLine("Sizes step by quarter octaves (×1.19); rates carry their binomial standard deviation.");
        if (plan.NotPlanned.Count > 0) sb.AppendLine($"Not planned (diagnostics read beside the verdict, never deciding it): {string.Join("; ", plan.NotPlanned)}.");
        return sb.ToString();
    }

    internal static string FamilyName(DriftKind? kind) => kind switch
    {
        DriftKind.Scale => "scale shift",
        DriftKind.TailDeficit => "tail deficit",
        DriftKind.Width => "width increase",
        DriftKind.SpikeFraction => "spike-share shift",
        DriftKind.CorrelationChange => "correlation change",
        _ => "—",
    };

    /// <summary>A planned size to three significant digits: the grid's step (×1.19) makes more spurious.</summary>
    private static string Approximately(long n)
    {
        var scale = Math.Pow(10, Math.Max(0, Math.Floor(Math.Log10(n)) - 2));
        return "≈" + InvariantNumber.Count((long)(Math.Round(n / scale) * scale));
    }

    private static string Percent(double s) => (s * 100).ToString("G3", CultureInfo.InvariantCulture) + "%";

    private static string Noise(double x) => x.ToString("G2", CultureInfo.InvariantCulture);

    private static string Short(double x) => InvariantNumber.Short(x);
}
