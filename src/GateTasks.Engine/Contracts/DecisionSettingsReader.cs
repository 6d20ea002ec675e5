using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>Reads the <c>decision</c> block into <see cref="DecisionSettings"/>; every key left out keeps its default.</summary>
internal static class DecisionSettingsReader
{
    public static DecisionSettings Read(YamlNodeReader r, YamlNode node)
    {
        var mapping = r.Mapping(node, ContractKeys.Decision);
        var d = DecisionSettings.Default with { Location = r.At(node) };
        foreach (var (key, _, value) in r.Entries(mapping, ContractKeys.Decision, ContractKeys.DecisionKeys))
        {
            switch (key)
            {
                case ContractKeys.Confidence:
                    var c = r.Number(value, "decision.confidence");
                    if (!(c >= 0.5 && c < 1)) throw r.Error(ErrorCodes.ContractBadValue, value, $"decision.confidence must be in [0.5, 1), got {c}.");
                    d = d with { Confidence = c };
                    break;
                case ContractKeys.FalseAlarm:
                    var a = r.Number(value, "decision.false-alarm");
                    if (!(a > 0 && a < 0.5)) throw r.Error(ErrorCodes.ContractBadValue, value, $"decision.false-alarm must be in (0, 0.5), got {a}.");
                    d = d with { FalseAlarm = a };
                    break;
                case ContractKeys.Correction:
                    d = d with
                    {
                        Correction = r.OneOf(value, "decision.correction", ContractKeys.Corrections) switch
                        {
                            "benjamini-hochberg" => Statistics.MultipleTestingMethod.BenjaminiHochberg,
                            "bonferroni" => Statistics.MultipleTestingMethod.Bonferroni,
                            _ => Statistics.MultipleTestingMethod.Holm,
                        },
                    };
                    break;
                case ContractKeys.Inconclusive:
                    d = d with { InconclusiveFails = r.OneOf(value, "decision.inconclusive", ContractKeys.InconclusivePolicies) == "fail" };
                    break;
            }
        }
        return d;
    }
}
