using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads the <c>correlations</c> list: each entry names a group of features (every pair among them is declared) and
/// the pair checks (pearson-max, spearman-max, chi2-2d-test); each pair may be declared once.
/// </summary>
internal static class CorrelationSpecReader
{
    public static List<CorrelationSpec> Read(YamlNodeReader r, YamlNode node, IReadOnlyList<FeatureSpec> features)
    {
        var list = new List<CorrelationSpec>();
        var names = features.Select(f => f.Name).ToList();
        foreach (var item in r.Sequence(node, ContractKeys.Correlations).Children)
        {
            var mapping = r.Mapping(item, "A correlation entry");
            var entries = r.Entries(mapping, "a correlation entry", ContractKeys.CorrelationKeys).ToDictionary(e => e.Key, e => e.Value);
            var featuresNode = r.Require(mapping, ContractKeys.PairFeatures, "A correlation entry");
            var group = ReadGroup(r, featuresNode, names);
            ToleranceCheck? Tolerance(string key, CheckKind kind)
            {
                if (!entries.TryGetValue(key, out var v)) return null;
                var t = r.Number(v, key);
                if (!(t > 0 && t <= 2)) throw r.Error(ErrorCodes.ContractBadValue, v, $"{key} must be in (0, 2], got {t}.");
                return new ToleranceCheck(kind, t, r.At(v));
            }
            var pearson = Tolerance(ContractKeys.PearsonMax, CheckKind.PearsonDifference);
            var spearman = Tolerance(ContractKeys.SpearmanMax, CheckKind.SpearmanDifference);
            GoodnessOfFitTest? chi2 = null;
            if (entries.TryGetValue(ContractKeys.Chi2Test2D, out var cv))
            {
                if (!YamlNodeReader.IsScalar(cv, ContractKeys.On) && !YamlNodeReader.IsScalar(cv, ContractKeys.Off))
                    throw r.Error(ErrorCodes.ContractBadValue, cv, $"{ContractKeys.Chi2Test2D} is a test without a tolerance: write 'on' or 'off'.");
                if (YamlNodeReader.IsScalar(cv, ContractKeys.On)) chi2 = new GoodnessOfFitTest(CheckKind.ChiSquare2DTest, r.At(cv));
            }
            if (pearson is null && spearman is null && chi2 is null)
                throw r.Error(ErrorCodes.ContractMissingKey, mapping, "A correlation entry needs pearson-max, spearman-max, chi2-2d-test or several.");
            // Every pair of the group, in the order listed.
            for (var i = 0; i < group.Count; i++)
            for (var j = i + 1; j < group.Count; j++)
            {
                var (first, second) = (group[i], group[j]);
                var earlier = list.FirstOrDefault(c => (c.First, c.Second) == (first, second) || (c.First, c.Second) == (second, first));
                if (earlier is not null)
                    throw r.Error(ErrorCodes.ContractBadValue, featuresNode,
                        $"The pair {first}~{second} is already declared at line {earlier.Location.Line}; declare each pair once.");
                list.Add(new CorrelationSpec(first, second, pearson, spearman, r.At(item), chi2));
            }
        }
        return list;
    }

    /// <summary>
    /// The features a correlation entry covers: a list of two or more (every pair among them), or <c>all</c> (every
    /// pair of the contract's features).
    /// </summary>
    private static List<string> ReadGroup(YamlNodeReader r, YamlNode node, List<string> names)
    {
        if (YamlNodeReader.IsScalar(node, ContractKeys.AllPairs))
        {
            if (names.Count < 2) throw r.Error(ErrorCodes.ContractBadValue, node, "'all' needs a contract with at least two features.");
            return names;
        }
        if (node is not YamlSequenceNode)
            throw r.Error(ErrorCodes.ContractBadValue, node, "features of a correlation entry is a list of two or more features, [first, second, …], or 'all'.");
        var sequence = r.Sequence(node, "features");
        if (sequence.Children.Count < 2)
            throw r.Error(ErrorCodes.ContractBadValue, sequence, "A correlation entry names at least two features, [first, second, …], or 'all'.");
        var group = new List<string>();
        foreach (var n in sequence.Children)
        {
            var name = r.String(n, "A feature of the pair");
            if (!names.Contains(name))
                throw r.Error(ErrorCodes.ContractBadValue, n, $"'{name}' is not a feature of this contract{NearestName.Hint(name, names)}.");
            if (group.Contains(name)) throw r.Error(ErrorCodes.ContractBadValue, n, $"'{name}' is listed twice; a correlation needs different features.");
            group.Add(name);
        }
        return group;
    }
}
