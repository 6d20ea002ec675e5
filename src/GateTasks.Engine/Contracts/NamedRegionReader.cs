using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads a <c>regions</c> mapping: each name to a value range (<c>[lower, upper]</c> or <c>range: [lower, upper]</c>)
/// or to reference quantiles (<c>quantiles: [p, q]</c>). The built-in names (core, tails, all) are refused.
/// </summary>
internal static class NamedRegionReader
{
    public static List<NamedRegion> Read(YamlNodeReader r, YamlNode node, string what)
    {
        var list = new List<NamedRegion>();
        foreach (var (keyNode, value) in r.Mapping(node, what).Children)
        {
            var name = r.String(keyNode, "A region name");
            if (name is ContractKeys.Core or ContractKeys.Tails or "all")
                throw r.Error(ErrorCodes.ContractBadValue, keyNode, $"'{name}' is a built-in region; pick another name.");
            if (value is YamlSequenceNode)
            {
                var (lo, hi) = r.Interval(value, $"region '{name}'");
                list.Add(new NamedRegion(name, lo, hi, false, r.At(keyNode)));
                continue;
            }
            var m = r.Mapping(value, $"region '{name}'");
            var e = r.Entries(m, $"region '{name}'", ContractKeys.NamedRegionKeys).ToDictionary(x => x.Key, x => x.Value);
            if (e.Count != 1) throw r.Error(ErrorCodes.ContractBadValue, value, $"Region '{name}' takes either 'range: [lower, upper]' or 'quantiles: [p, q]'.");
            if (e.TryGetValue(ContractKeys.Range, out var range))
            {
                var (lo, hi) = r.Interval(range, $"region '{name}'");
                list.Add(new NamedRegion(name, lo, hi, false, r.At(keyNode)));
            }
            else
            {
                var (lo, hi) = r.Interval(e[ContractKeys.Quantiles], $"the quantiles of region '{name}'");
                if (lo < 0 || hi > 1) throw r.Error(ErrorCodes.ContractBadValue, e[ContractKeys.Quantiles], "Quantiles must lie within [0, 1].");
                list.Add(new NamedRegion(name, lo, hi, true, r.At(keyNode)));
            }
        }
        return list;
    }
}
