using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads one entry of <c>features</c> into a <see cref="FeatureSpec"/>, the <see cref="FeatureDefaults"/> filling
/// what it leaves out: its column or expression, kind, binning, core, spike, regions, checks and non-finite policy.
/// (Its category block, if any, is read apart: <see cref="CategoryBlockReader"/>.)
/// </summary>
internal static class FeatureSpecReader
{
    public static FeatureSpec Read(YamlNodeReader r, YamlNode node, FeatureDefaults defaults)
    {
        var mapping = r.Mapping(node, "A feature");
        var entries = r.Entries(mapping, "a feature", ContractKeys.FeatureKeys).ToDictionary(e => e.Key, e => e.Value);
        var nameNode = r.Require(mapping, ContractKeys.Name, "A feature");
        var name = r.String(nameNode, "The feature name");
        var what = $"feature '{name}'";

        string? expression = null;
        YamlNode columnNode;
        if (entries.TryGetValue(ContractKeys.Expression, out var expressionNode))
        {
            if (entries.TryGetValue(ContractKeys.Column, out var both))
                throw r.Error(ErrorCodes.ContractBadValue, both, $"{what} has both a column and an expression; a derived feature takes only the expression.");
            expression = r.Expression(expressionNode, $"The expression of {what}");
            columnNode = expressionNode;
        }
        else columnNode = entries.GetValueOrDefault(ContractKeys.Column) ?? nameNode;
        var column = expression is null ? r.String(columnNode, $"The column of {what}") : name;

        var kind = entries.TryGetValue(ContractKeys.Kind, out var k)
            ? r.OneOf(k, $"The kind of {what}", ContractKeys.Kinds) == "discrete" ? FeatureKind.Discrete : FeatureKind.Continuous
            : FeatureKind.Continuous;

        BinningSpec binning;
        if (kind == FeatureKind.Discrete)
        {
            if (entries.TryGetValue(ContractKeys.Binning, out var b))
                throw r.Error(ErrorCodes.ContractBadValue, b, $"{what} is discrete: it gets one bin per value, so it takes no binning.");
            binning = new CategoryBinning(r.At(nameNode));
        }
        else
        {
            binning = entries.TryGetValue(ContractKeys.Binning, out var b)
                ? BinningSpecReader.Read(r, b, $"The binning of {what}")
                : defaults.Binning ?? new QuantileBinning(BinningSpecReader.DefaultBins, r.At(nameNode));
        }

        var core = entries.TryGetValue(ContractKeys.Core, out var c)
            ? CoreSpecReader.Read(r, c, $"The core of {what}")
            : defaults.Core ?? CoreSpecReader.Central(CoreSpecReader.DefaultFraction, r.At(nameNode));

        double? spike = null;
        if (entries.TryGetValue(ContractKeys.Spike, out var sp))
        {
            if (kind == FeatureKind.Discrete)
                throw r.Error(ErrorCodes.ContractBadValue, sp, $"{what} is discrete: every value is a category already, so it takes no spike; use fraction-max.");
            spike = r.Number(sp, $"The spike of {what}");
        }

        var checks = defaults.Checks.Copy();
        // A default far-tail tolerance is meant for continuous features; discrete ones have no quantiles to count beyond.
        if (kind == FeatureKind.Discrete) checks.RemoveAll(CheckKind.FarTail);
        if (entries.TryGetValue(ContractKeys.Checks, out var ch)) CheckSpecReader.Read(r, ch, $"the checks of {what}", checks);
        var regionsOfFeature = entries.TryGetValue(ContractKeys.Regions, out var rn) ? NamedRegionReader.Read(r, rn, $"The regions of {what}") : defaults.Regions ?? [];
        var list = checks.ToList();
        foreach (var declared in list.OfType<RegionToleranceCheck>().Where(k => k.Region.Kind == Region.Named))
        {
            if (regionsOfFeature.All(g => g.Name != declared.Region.Name))
                throw new GateInputException(ErrorCodes.ContractUnknownKey,
                    $"{what} declares no region '{declared.Region.Name}'{NearestName.Hint(declared.Region.Name, regionsOfFeature.Select(g => g.Name).Append(ContractKeys.Core).Append(ContractKeys.Tails))}; " +
                    "declare it under 'regions:' (or use core / tails).", declared.RegionLocation);
        }
        if (kind == FeatureKind.Discrete && list.FirstOrDefault(c => c.Kind is CheckKind.FarTail) is { } continuousOnly)
            throw new GateInputException(ErrorCodes.ContractBadValue,
                $"{continuousOnly.Key} counts events beyond quantiles, which a discrete feature ('{name}') does not have.", continuousOnly.Location);
        if (list.Count == 0)
            throw r.Error(ErrorCodes.ContractBadValue, nameNode,
                $"{char.ToUpperInvariant(what[0])}{what[1..]} has no checks (none of its own, none in defaults); it would always pass.");

        var nonFinite = entries.TryGetValue(ContractKeys.NonFinite, out var nf) ? ReadNonFinite(r, nf, $"The non-finite setting of {what}") : defaults.NonFinite;
        return new FeatureSpec(name, column, kind, binning, core, list, r.At(nameNode), r.TextStart(columnNode), spike, expression, regionsOfFeature)
        {
            AllowNonFinite = nonFinite?.Allow ?? false,
            NonFiniteLocation = nonFinite?.Location,
        };
    }

    /// <summary>A <c>non-finite</c> setting: <c>allow</c> or <c>fail</c>, and where it stands.</summary>
    public static (bool Allow, SourceLocation Location) ReadNonFinite(YamlNodeReader r, YamlNode node, string what) =>
        (r.OneOf(node, what, ContractKeys.NonFinitePolicies) == "allow", r.At(node));
}
