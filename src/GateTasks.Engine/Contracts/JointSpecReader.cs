using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads the <c>joint</c> block: two or more features checked together by <c>frechet-max</c>, <c>kernel-distance-max</c>
/// (tolerances), at least one of the two. The retired energy-test keys are refused with their own code.
/// </summary>
internal static class JointSpecReader
{
    public static JointSpec Read(YamlNodeReader r, YamlNode node, IReadOnlyList<FeatureSpec> features)
    {
        var mapping = r.Mapping(node, ContractKeys.Joint);
        foreach (var (key, value) in mapping.Children)
            if (key is YamlScalarNode { Value: { } k } && ContractKeys.RetiredJointKeys.Contains(k))
                throw r.Error(ErrorCodes.ContractRetiredKey, key,
                    $"joint.{k} was retired with the energy test, whose bounded subsample missed broken correlations; " +
                    $"state {ContractKeys.FrechetMax} and/or {ContractKeys.KernelDistanceMax}, which use every event, and drop '{k}'.");
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
        var frechet = Tolerance(r, e, ContractKeys.FrechetMax, CheckKind.FrechetDistance);
        var kernel = Tolerance(r, e, ContractKeys.KernelDistanceMax, CheckKind.KernelDistance);
        if (kernel is not null && list.Count > JointSpec.MaxKernelFeatures)
            throw r.Error(ErrorCodes.ContractBadValue, e[ContractKeys.KernelDistanceMax],
                $"{ContractKeys.KernelDistanceMax} takes at most {JointSpec.MaxKernelFeatures} joint features (its streamed sums grow as the cube of their number), the block has {list.Count}; " +
                $"drop features or use {ContractKeys.FrechetMax}.");
        if (frechet is null && kernel is null)
            throw r.Error(ErrorCodes.ContractMissingKey, mapping,
                $"The joint check needs {ContractKeys.FrechetMax}, {ContractKeys.KernelDistanceMax} or both.");
        return new JointSpec(list, r.At(node)) { Frechet = frechet, KernelDistance = kernel };
    }

    /// <summary>A tolerance of the block: a positive, finite number (the distances are non-negative; 0 could never pass).</summary>
    private static ToleranceCheck? Tolerance(YamlNodeReader r, Dictionary<string, YamlNode> entries, string key, CheckKind kind)
    {
        if (!entries.TryGetValue(key, out var v)) return null;
        var t = r.Number(v, $"joint.{key}");
        if (!(t > 0 && double.IsFinite(t))) throw r.Error(ErrorCodes.ContractBadValue, v, $"joint.{key} must be positive, got {t}.");
        return new ToleranceCheck(kind, t, r.At(v));
    }
}
