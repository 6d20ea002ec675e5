using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>Reads the <c>joint</c> block: two or more features tested together by the energy test, its subsample size and permutations.</summary>
internal static class JointSpecReader
{
    public static JointSpec Read(YamlNodeReader r, YamlNode node, IReadOnlyList<FeatureSpec> features)
    {
        var mapping = r.Mapping(node, ContractKeys.Joint);
        var e = r.Entries(mapping, ContractKeys.Joint, ContractKeys.JointKeys).ToDictionary(x => x.Key, x => x.Value);
        var names = features.Select(f => f.Name).ToList();
        var list = r.Sequence(r.Require(mapping, ContractKeys.PairFeatures, "The joint check"), "joint.features").Children.Select(n =>
        {
            var name = r.String(n, "A joint feature");
            if (!names.Contains(name)) throw r.Error(ErrorCodes.ContractBadValue, n, $"'{name}' is not a feature of this contract{NearestName.Hint(name, names)}.");
            return name;
        }).ToList();
        if (list.Count < 2 || list.Distinct().Count() != list.Count)
            throw r.Error(ErrorCodes.ContractBadValue, mapping, "The joint check needs at least two different features.");
        var testNode = r.Require(mapping, ContractKeys.EnergyTest, "The joint check");
        if (!YamlNodeReader.IsScalar(testNode, ContractKeys.On))
            throw r.Error(ErrorCodes.ContractBadValue, testNode, "energy-test takes 'on' (leave the joint block out to switch it off).");
        var subsample = JointSpec.DefaultSubsample;
        if (e.TryGetValue(ContractKeys.Subsample, out var sn))
        {
            subsample = r.Integer(sn, "joint.subsample");
            if (subsample < 50 || 2 * subsample > Statistics.EnergyDistance.MaxPooledRows)
                throw r.Error(ErrorCodes.ContractBadValue, sn, $"joint.subsample must be between 50 and {Statistics.EnergyDistance.MaxPooledRows / 2}, got {subsample}.");
        }
        var permutations = 0; // chosen from the family size and level at check time
        if (e.TryGetValue(ContractKeys.Permutations, out var pn))
        {
            permutations = r.Integer(pn, "joint.permutations");
            if (permutations < 99 || permutations > 10_000)
                throw r.Error(ErrorCodes.ContractBadValue, pn, $"joint.permutations must be between 99 and 10000, got {permutations}.");
        }
        return new JointSpec(list, subsample, permutations, new GoodnessOfFitTest(CheckKind.EnergyTest, r.At(testNode)), r.At(node));
    }
}
