using System.Text;
using System.Text.Json;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.IO;
using GateTasks.Engine.Planning;

namespace GateTasks.Engine.Reports;

/// <summary>
/// A sample-size plan as JSON (<c>plan --json</c>), one document of the result family (docs/result-json.md): per
/// check, the events a perfect surrogate needs to pass and the smallest drift caught at the detection size; then the
/// size for the whole contract. Sizes no simulated size reached are null. Written atomically.
/// </summary>
internal static class PlanJson
{
    public static void Write(string path, PrecisionContract contract, string referenceSha256, SampleSizePlan plan) =>
        AtomicFile.WriteText(path, Render(contract, referenceSha256, plan));

    public static string Render(PrecisionContract contract, string referenceSha256, SampleSizePlan plan)
    {
        using var buffer = new MemoryStream();
        using (var w = new Utf8JsonWriter(buffer, ResultJsonHead.Options))
        {
            var d = contract.Decision;
            w.WriteStartObject();
            ResultJsonHead.Write(w, "plan", finished: true);
            ResultJsonHead.WriteContract(w, contract);
            w.WriteStartObject("reference");
            w.WriteString("path", contract.ReferenceFullPath);
            w.WriteString("sha256", referenceSha256);
            w.WriteNumber("events", plan.ReferenceEvents);
            w.WriteEndObject();
            ResultJsonHead.WriteDecision(w, d);
            w.WriteNumber("target", plan.Target);
            w.WriteNumber("power", plan.Power);
            w.WriteNumber("replicas", plan.Replicas);
            w.WriteNumber("detection_events", plan.DetectionEvents);
            if (plan.ContractEvents is { } n) w.WriteNumber("contract_events", n); else w.WriteNull("contract_events");
            ResultJsonHead.NumberOrNull(w, "contract_pass_rate", plan.ContractPassRate);
            ResultJsonHead.NumberOrNull(w, "contract_pass_rate_noise", plan.ContractPassRateNoise);
            w.WriteStartArray("checks");
            foreach (var c in plan.Checks)
            {
                w.WriteStartObject();
                w.WriteString("subject", c.Subject.Name);
                w.WriteString("label", SubjectLabel.Of(c.Subject));
                w.WriteString("check", c.Check.Label);
                ResultJsonHead.NumberOrNull(w, "tolerance", c.Check is ToleranceCheck t ? t.Tolerance : double.NaN);
                if (c.EventsToPass is { } e) w.WriteNumber("events_to_pass", e); else w.WriteNull("events_to_pass");
                ResultJsonHead.NumberOrNull(w, "pass_rate", c.PassRate);
                ResultJsonHead.NumberOrNull(w, "pass_rate_noise", c.PassRateNoise);
                if (c.Family is { } family) w.WriteString("drift_kind", PlanTable.FamilyName(family)); else w.WriteNull("drift_kind");
                ResultJsonHead.NumberOrNull(w, "detectable_drift", c.DetectableDrift ?? double.NaN);
                ResultJsonHead.NumberOrNull(w, "detection_rate", c.DetectionRate);
                ResultJsonHead.NumberOrNull(w, "effect_at_drift", c.EffectAtDrift ?? double.NaN);
                ResultJsonHead.NumberOrNull(w, "drift_searched_up_to", c.DriftSearchedUpTo);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteStartArray("not_planned");
            foreach (var s in plan.NotPlanned) w.WriteStringValue(s);
            w.WriteEndArray();
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(buffer.ToArray()) + "\n";
    }
}
