using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads a <c>checks</c> mapping into a <see cref="CheckTable"/>: per check key a tolerance, a mapping of regions to
/// tolerances (checks with regions), <c>on</c> (goodness-of-fit tests) or <c>off</c> (drops a default).
/// </summary>
internal static class CheckSpecReader
{
    public static void Read(YamlNodeReader r, YamlNode node, string what, CheckTable checks)
    {
        var mapping = r.Mapping(node, what);
        foreach (var (key, _, value) in r.Entries(mapping, what, ContractKeys.CheckKeys.ToArray()))
        {
            var kind = ContractKeys.CheckFromKey(key)!.Value;
            if (YamlNodeReader.IsScalar(value, ContractKeys.Off))
            {
                checks.RemoveAll(kind);
                continue;
            }
            if (value is YamlMappingNode regions)
            {
                if (!ContractKeys.HasRegions(kind))
                    throw r.Error(ErrorCodes.ContractBadValue, value, $"{key} takes one tolerance, not a mapping of regions.");
                checks.Remove(kind, CheckRegion.All);
                foreach (var (keyNode, v) in regions.Children)
                {
                    var name = r.String(keyNode, $"A region of {key}");
                    var region = name == ContractKeys.Core ? CheckRegion.Core : name == ContractKeys.Tails ? CheckRegion.Tails : CheckRegion.Declared(name);
                    // Declared regions are checked against the feature's declarations once defaults and feature are merged.
                    if (YamlNodeReader.IsScalar(v, ContractKeys.Off)) checks.Remove(kind, region);
                    else checks.Set(new RegionToleranceCheck(kind, region, Tolerance(r, v, kind, $"{key}.{name}"), r.At(v), r.At(keyNode)));
                }
                continue;
            }
            checks.RemoveAll(kind);
            if (ContractKeys.IsTest(kind))
            {
                if (!YamlNodeReader.IsScalar(value, ContractKeys.On))
                    throw r.Error(ErrorCodes.ContractBadValue, value, $"{key} is a goodness-of-fit test without a tolerance: write 'on' or 'off'.");
                checks.Set(new GoodnessOfFitTest(kind, r.At(value)));
                continue;
            }
            var tolerance = Tolerance(r, value, kind, key);
            checks.Set(ContractKeys.HasRegions(kind)
                ? new RegionToleranceCheck(kind, CheckRegion.All, tolerance, r.At(value))
                : new ToleranceCheck(kind, tolerance, r.At(value)));
        }
    }

    private static double Tolerance(YamlNodeReader r, YamlNode node, CheckKind kind, string what)
    {
        var v = r.Number(node, what);
        var (ok, rule) = kind switch
        {
            CheckKind.KolmogorovSmirnov => (v > 0 && v <= 1, "in (0, 1]"),
            CheckKind.JensenShannon => (v > 0 && v <= Math.Log(2), "in (0, ln 2]"),
            _ => (v > 0, "positive"),
        };
        if (!ok) throw r.Error(ErrorCodes.ContractBadValue, node, $"{what} must be {rule}, got {v}.");
        return v;
    }
}
