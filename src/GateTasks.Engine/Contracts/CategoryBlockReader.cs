using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads a feature's <c>categories</c> block: the feature's checks repeated for each category of a discrete column or
/// expression, each category a feature of its own with that condition; with fraction-max, the categories' population
/// fractions are checked as one more (discrete) feature.
/// </summary>
internal static class CategoryBlockReader
{
    public static List<FeatureSpec> Read(YamlNodeReader r, YamlNode node, FeatureSpec parent)
    {
        var mapping = r.Mapping(node, $"The categories of feature '{parent.Name}'");
        var e = r.Entries(mapping, "categories", ContractKeys.CategoryKeys).ToDictionary(x => x.Key, x => x.Value);
        var byNode = r.Require(mapping, ContractKeys.By, "categories");
        var by = r.Expression(byNode, "categories.by");
        var byAt = r.TextStart(byNode);
        var valuesNode = r.Sequence(r.Require(mapping, ContractKeys.Values, "categories"), "categories.values");
        var values = valuesNode.Children.Select(v => r.Number(v, "A category value")).ToList();
        if (values.Count < 2 || values.Distinct().Count() != values.Count)
            throw r.Error(ErrorCodes.ContractBadValue, valuesNode, "categories.values needs at least two different values.");
        var label = System.Text.RegularExpressions.Regex.IsMatch(by, "^[A-Za-z_][A-Za-z0-9_]*$") ? by : "category";
        var own = e.TryGetValue(ContractKeys.PerCategory, out var pc) ? ReadPerCategory(r, pc, parent, values) : [];
        var scalingNode = e.GetValueOrDefault(ContractKeys.ShareScaling);
        var scaling = scalingNode is null ? null : ReadScaling(r, scalingNode, values.Count);
        var list = values.Select(v =>
        {
            var text = v.ToString("R", System.Globalization.CultureInfo.InvariantCulture);
            var checks = own.TryGetValue(v, out var stated) ? stated : parent.Checks;
            return parent with
            {
                Name = $"{parent.Name}[{label}={text}]",
                Location = r.At(valuesNode.Children[values.IndexOf(v)]),
                Condition = new SelectionSpec($"({by}) == {text}", byAt),
                Category = new CategoryCondition(by, v),
                Checks = checks,
                // A tolerance the category states for itself is taken as written; only inherited ones are scaled.
                ShareScaling = scaling is null ? null
                    : new ShareScaling(scaling.Value.FullShare, scaling.Value.AtMost, r.At(scalingNode!),
                        checks.Where(c => !parent.Checks.Any(p => ReferenceEquals(p, c))).Select(c => c.Label).ToHashSet(StringComparer.Ordinal)),
            };
        }).ToList();
        if (e.TryGetValue("fraction-max", out var fn))
        {
            var tolerance = r.Number(fn, "categories.fraction-max");
            if (!(tolerance > 0 && tolerance <= 1)) throw r.Error(ErrorCodes.ContractBadValue, fn, $"categories.fraction-max must be in (0, 1], got {tolerance}.");
            list.Add(new FeatureSpec($"{parent.Name}[{label}]", $"{parent.Name}[{label}]", FeatureKind.Discrete,
                new CategoryBinning(byAt), parent.Core,
                [new ToleranceCheck(CheckKind.Fraction, tolerance, r.At(fn))], r.At(byNode), byAt, Expression: by));
        }
        return list;
    }

    /// <summary>
    /// <c>per-category</c>: for some categories, a checks mapping over the feature's checks (a tolerance of its own, a
    /// region's, or <c>off</c>); a category cannot add a check its feature does not have.
    /// </summary>
    private static Dictionary<double, IReadOnlyList<CheckSpec>> ReadPerCategory(YamlNodeReader r, YamlNode node, FeatureSpec parent, List<double> values)
    {
        var mapping = r.Mapping(node, $"categories.{ContractKeys.PerCategory} of feature '{parent.Name}'");
        var result = new Dictionary<double, IReadOnlyList<CheckSpec>>();
        var keys = new Dictionary<double, YamlNode>();
        foreach (var (keyNode, value) in mapping.Children)
        {
            var text = (keyNode as YamlScalarNode)?.Value;
            if (!double.TryParse(text, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out var category)
                || !values.Contains(category))
                throw r.Error(ErrorCodes.CategoryNotListed, keyNode,
                    $"categories.{ContractKeys.PerCategory} names category '{text}', which is not one of the block's values " +
                    $"[{string.Join(", ", values.Select(v => v.ToString("R", System.Globalization.CultureInfo.InvariantCulture)))}].");
            if (keys.TryGetValue(category, out var first))
                throw r.Error(ErrorCodes.CategoryRepeated, keyNode,
                    $"categories.{ContractKeys.PerCategory} names category {text} twice; the first is at line {first.Start.Line}.");
            keys[category] = keyNode;
            var table = new CheckTable();
            foreach (var c in parent.Checks) table.Set(c);
            var what = $"the checks of category {text} of feature '{parent.Name}'";
            CheckSpecReader.Read(r, value, what, table);
            var checks = table.ToList();
            foreach (var c in checks.Where(c => !parent.Checks.Any(p => p.Kind == c.Kind && p.RegionName == c.RegionName)))
                throw new GateInputException(ErrorCodes.CategoryCheckNotInherited,
                    $"Category {text} of feature '{parent.Name}' states {c.Label}, which the feature does not check; a category may change the " +
                    $"tolerances of its feature's checks ({string.Join(", ", parent.Checks.Select(p => p.Label))}) or switch them off, not add one.", c.Location);
            if (checks.Count == 0)
                throw r.Error(ErrorCodes.ContractBadValue, value, $"Category {text} of feature '{parent.Name}' has every check switched off; it would always pass.");
            result[category] = checks;
        }
        return result;
    }

    /// <summary><c>share-scaling</c>: the rule (<c>inverse-sqrt</c>), the share a tolerance holds for as written (default: an even split), the largest factor (default 10).</summary>
    private static (double FullShare, double AtMost)? ReadScaling(YamlNodeReader r, YamlNode node, int categories)
    {
        var mapping = r.Mapping(node, $"categories.{ContractKeys.ShareScaling}");
        var e = r.Entries(mapping, $"categories.{ContractKeys.ShareScaling}", ContractKeys.ShareScalingKeys).ToDictionary(x => x.Key, x => x.Value);
        var ruleNode = r.Require(mapping, ContractKeys.Rule, $"categories.{ContractKeys.ShareScaling}");
        var rule = (ruleNode as YamlScalarNode)?.Value ?? "";
        if (!ContractKeys.ShareScalingRules.Contains(rule))
            throw r.Error(ErrorCodes.ShareScalingRule, ruleNode,
                $"categories.{ContractKeys.ShareScaling}.{ContractKeys.Rule} '{rule}' is not a rule{NearestName.Hint(rule, ContractKeys.ShareScalingRules)}; " +
                $"known: {string.Join(", ", ContractKeys.ShareScalingRules)} (the tolerance × √(full-share / share)).");
        var fullShare = 1.0 / categories;
        if (e.TryGetValue(ContractKeys.FullShare, out var fs))
        {
            fullShare = r.Number(fs, $"categories.{ContractKeys.ShareScaling}.{ContractKeys.FullShare}");
            if (!(fullShare > 0 && fullShare <= 1))
                throw r.Error(ErrorCodes.ShareScalingBound, fs,
                    $"categories.{ContractKeys.ShareScaling}.{ContractKeys.FullShare} is the share of the events a tolerance holds for as written; it must be in (0, 1], got {fullShare}.");
        }
        var atMost = 10.0;
        if (e.TryGetValue(ContractKeys.AtMost, out var am))
        {
            atMost = r.Number(am, $"categories.{ContractKeys.ShareScaling}.{ContractKeys.AtMost}");
            if (!(atMost >= 1))
                throw r.Error(ErrorCodes.ShareScalingBound, am,
                    $"categories.{ContractKeys.ShareScaling}.{ContractKeys.AtMost} is the largest factor a tolerance is widened by; it must be at least 1, got {atMost}.");
        }
        return (fullShare, atMost);
    }
}
