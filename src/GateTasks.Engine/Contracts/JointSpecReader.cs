using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads the <c>joint</c> block: two or more features checked together by <c>frechet-max</c>, <c>kernel-distance-max</c>
/// and the sliced <c>sliced-ks-max</c> and <c>sliced-wasserstein-max</c> (tolerances), at least one. The retired
/// energy-test keys are refused with their own code.
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
                    $"state {ContractKeys.FrechetMax}, {ContractKeys.KernelDistanceMax}, {ContractKeys.SlicedKsMax} or {ContractKeys.SlicedWassersteinMax} and drop '{k}' " +
                    $"(the kernel distance's seeded subsample is set by {ContractKeys.KernelRows}).");
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
        var sliced = Sliced(r, e, ContractKeys.SlicedKsMax, CheckKind.SlicedKolmogorovSmirnov)
            .Concat(Sliced(r, e, ContractKeys.SlicedWassersteinMax, CheckKind.SlicedWasserstein)).ToList();
        var projections = JointSpec.DefaultProjections;
        if (e.TryGetValue(ContractKeys.Projections, out var kn))
        {
            if (sliced.Count == 0)
                throw r.Error(ErrorCodes.ContractBadValue, kn,
                    $"joint.{ContractKeys.Projections} sets the directions of {ContractKeys.SlicedKsMax} and {ContractKeys.SlicedWassersteinMax}; the block states neither.");
            projections = r.Integer(kn, $"joint.{ContractKeys.Projections}");
            if (projections < JointSpec.MinProjections || projections > JointSpec.MaxProjections)
                throw r.Error(ErrorCodes.ContractBadValue, kn,
                    $"joint.{ContractKeys.Projections} must be between {JointSpec.MinProjections} and {JointSpec.MaxProjections}, got {projections}.");
        }
        var kernelRows = JointSpec.DefaultKernelRows;
        if (e.TryGetValue(ContractKeys.KernelRows, out var kr))
        {
            if (kernel is null)
                throw r.Error(ErrorCodes.ContractBadValue, kr,
                    $"joint.{ContractKeys.KernelRows} sets how many sample rows {ContractKeys.KernelDistanceMax} is computed on; the block does not state it.");
            kernelRows = r.Integer(kr, $"joint.{ContractKeys.KernelRows}");
            if (kernelRows < JointSpec.MinKernelRows || kernelRows > JointSpec.MaxKernelRows)
                throw r.Error(ErrorCodes.ContractBadValue, kr,
                    $"joint.{ContractKeys.KernelRows} must be a whole number between {JointSpec.MinKernelRows} and {JointSpec.MaxKernelRows}, got {kernelRows}.");
        }
        if (frechet is null && kernel is null && sliced.Count == 0)
            throw r.Error(ErrorCodes.ContractMissingKey, mapping,
                $"The joint check needs {ContractKeys.FrechetMax}, {ContractKeys.KernelDistanceMax}, {ContractKeys.SlicedKsMax}, {ContractKeys.SlicedWassersteinMax} or several.");
        return new JointSpec(list, r.At(node)) { Frechet = frechet, KernelDistance = kernel, Sliced = sliced, Projections = projections, KernelRows = kernelRows };
    }

    /// <summary>
    /// A sliced key's tolerances: a mapping with <c>worst</c> and/or <c>mean</c>, each a positive, finite number (one
    /// check each, worst first); anything else there is refused where it stands.
    /// </summary>
    private static IEnumerable<SlicedToleranceCheck> Sliced(YamlNodeReader r, Dictionary<string, YamlNode> entries, string key, CheckKind kind)
    {
        if (!entries.TryGetValue(key, out var v)) return [];
        if (v is not YamlMappingNode map)
            throw r.Error(ErrorCodes.ContractBadValue, v,
                $"joint.{key} takes a mapping of tolerances, e.g. {{ {ContractKeys.Worst}: 0.02, {ContractKeys.Mean}: 0.01 }}, not a single value.");
        var given = r.Entries(map, $"joint.{key}", ContractKeys.SlicedKeys).ToDictionary(x => x.Key, x => x.Value);
        if (given.Count == 0)
            throw r.Error(ErrorCodes.ContractMissingKey, v, $"joint.{key} needs {ContractKeys.Worst}, {ContractKeys.Mean} or both.");
        var result = new List<SlicedToleranceCheck>();
        foreach (var summary in ContractKeys.SlicedKeys)
        {
            if (!given.TryGetValue(summary, out var t)) continue;
            var tolerance = r.Number(t, $"joint.{key}.{summary}");
            if (!(tolerance > 0 && double.IsFinite(tolerance))) throw r.Error(ErrorCodes.ContractBadValue, t, $"joint.{key}.{summary} must be positive, got {tolerance}.");
            result.Add(new SlicedToleranceCheck(kind, summary == ContractKeys.Mean, tolerance, r.At(t)));
        }
        return result;
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
