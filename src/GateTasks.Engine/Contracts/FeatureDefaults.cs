using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// The <c>defaults</c> block: what a feature gets for each key it leaves out (binning, core, regions, non-finite
/// policy), and the checks every feature starts from. Null where the block does not say.
/// </summary>
internal sealed record FeatureDefaults(BinningSpec? Binning, CoreSpec? Core, CheckTable Checks, List<NamedRegion>? Regions = null,
    (bool Allow, SourceLocation Location)? NonFinite = null)
{
    /// <summary>A contract without a defaults block.</summary>
    public static FeatureDefaults None => new(null, null, new CheckTable());

    public static FeatureDefaults Read(YamlNodeReader r, YamlNode node)
    {
        var mapping = r.Mapping(node, ContractKeys.Defaults);
        BinningSpec? binning = null;
        CoreSpec? core = null;
        List<NamedRegion>? regions = null;
        (bool, SourceLocation)? nonFinite = null;
        var checks = new CheckTable();
        foreach (var (key, _, value) in r.Entries(mapping, ContractKeys.Defaults, ContractKeys.DefaultsKeys))
        {
            switch (key)
            {
                case ContractKeys.Binning: binning = BinningSpecReader.Read(r, value, "defaults.binning"); break;
                case ContractKeys.Core: core = CoreSpecReader.Read(r, value, "defaults.core"); break;
                case ContractKeys.Regions: regions = NamedRegionReader.Read(r, value, "defaults.regions"); break;
                case ContractKeys.Checks: CheckSpecReader.Read(r, value, "defaults.checks", checks); break;
                case ContractKeys.NonFinite: nonFinite = FeatureSpecReader.ReadNonFinite(r, value, "defaults.non-finite"); break;
            }
        }
        return new FeatureDefaults(binning, core, checks, regions, nonFinite);
    }
}
