using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>Reads the <c>acceptance</c> block into <see cref="AcceptanceSettings"/>; every key left out keeps its default.</summary>
internal static class AcceptanceSettingsReader
{
    /// <summary>Reads the block of the contract at <paramref name="path"/> (which names the default ledger).</summary>
    public static AcceptanceSettings Read(YamlNodeReader r, YamlNode node, string path)
    {
        var mapping = r.Mapping(node, ContractKeys.Acceptance);
        var a = AcceptanceSettings.Default(path) with { Location = r.At(node) };
        foreach (var (key, _, value) in r.Entries(mapping, ContractKeys.Acceptance, ContractKeys.AcceptanceKeys))
        {
            bool Switch(string what)
            {
                if (YamlNodeReader.IsScalar(value, ContractKeys.On)) return true;
                if (YamlNodeReader.IsScalar(value, ContractKeys.Off)) return false;
                throw r.Error(ErrorCodes.ContractBadValue, value, $"{what} takes 'on' or 'off'.");
            }
            switch (key)
            {
                case ContractKeys.Ledger:
                    var ledger = r.String(value, "acceptance.ledger");
                    if (ledger.Length == 0) throw r.Error(ErrorCodes.ContractBadValue, value, "acceptance.ledger needs a file name.");
                    a = a with { LedgerPath = ledger, LedgerLocation = r.At(value) };
                    break;
                case ContractKeys.Required:
                    a = a with { Required = Switch("acceptance.required") };
                    break;
                case ContractKeys.Tightening:
                    var policy = r.String(value, "acceptance.tightening");
                    if (!ContractKeys.TighteningPolicies.Contains(policy))
                        throw r.Error(ErrorCodes.ContractBadValue, value,
                            $"acceptance.tightening is 'free' (tightening needs no entry) or 'record', got '{policy}'{NearestName.Hint(policy, ContractKeys.TighteningPolicies)}.");
                    a = a with { RecordTightening = policy == "record" };
                    break;
                case ContractKeys.Ratchet:
                    a = a with { Ratchet = Switch("acceptance.ratchet") };
                    break;
            }
        }
        return a;
    }
}
