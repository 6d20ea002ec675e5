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
        var by = r.String(byNode, "categories.by");
        var byAt = r.TextStart(byNode);
        var valuesNode = r.Sequence(r.Require(mapping, ContractKeys.Values, "categories"), "categories.values");
        var values = valuesNode.Children.Select(v => r.Number(v, "A category value")).ToList();
        if (values.Count < 2 || values.Distinct().Count() != values.Count)
            throw r.Error(ErrorCodes.ContractBadValue, valuesNode, "categories.values needs at least two different values.");
        var label = System.Text.RegularExpressions.Regex.IsMatch(by, "^[A-Za-z_][A-Za-z0-9_]*$") ? by : "category";
        var list = values.Select(v =>
        {
            var text = v.ToString("R", System.Globalization.CultureInfo.InvariantCulture);
            return parent with
            {
                Name = $"{parent.Name}[{label}={text}]",
                Location = r.At(valuesNode.Children[values.IndexOf(v)]),
                Condition = new SelectionSpec($"({by}) == {text}", byAt),
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
}
