using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads a precision contract (YAML, schema version 1) into a <see cref="PrecisionContract"/>, applying the
/// defaults block to every feature. Every problem is a <see cref="GateInputException"/> at the offending
/// line and column; nothing is silently ignored.
/// </summary>
internal static class ContractLoader
{
    public const int SupportedVersion = 1;
    private const int DefaultBins = 40;
    private const double DefaultCoreFraction = 0.90;
    private const int MaxBins = 100_000;

    /// <summary>Loads and validates the contract at <paramref name="path"/>.</summary>
    public static PrecisionContract Load(string path)
    {
        InputFileGuard.VerifyContract(path);
        string text;
        try
        {
            text = File.ReadAllText(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new GateInputException(ErrorCodes.ContractNotFound,
                e is FileNotFoundException or DirectoryNotFoundException
                    ? $"Contract file not found: {Path.GetFullPath(path)}"
                    : $"Contract file cannot be read: {e.Message}",
                new SourceLocation(path));
        }
        var contract = Parse(text, path);
        RepositoryBoundary.Verify(contract);
        return contract;
    }

    /// <summary>Parses contract text; <paramref name="path"/> names the file in messages and anchors relative paths.</summary>
    public static PrecisionContract Parse(string text, string path)
    {
        var r = new YamlNodeReader(path);
        YamlShapeGuard.Verify(text, path);
        var stream = new YamlStream();
        try
        {
            stream.Load(new StringReader(text));
        }
        catch (YamlException e)
        {
            throw new GateInputException(ErrorCodes.ContractSyntax, $"Not valid YAML: {InnerMessage(e)}",
                new SourceLocation(path, (int)e.Start.Line, (int)e.Start.Column));
        }
        catch (Exception e) when (e is InvalidOperationException or ArgumentException)
        {
            // YamlDotNet gives up this way on some malformed text (found by fuzzing), without a position.
            throw new GateInputException(ErrorCodes.ContractSyntax, $"Not valid YAML: {e.Message}", new SourceLocation(path, 1, 1));
        }
        if (stream.Documents.Count != 1)
            throw new GateInputException(ErrorCodes.ContractSyntax,
                stream.Documents.Count == 0 ? "The contract is empty." : "The contract must be a single YAML document.",
                new SourceLocation(path, 1, 1));

        var root = r.Mapping(stream.Documents[0].RootNode, "The contract");
        var top = r.Entries(root, "the contract", ContractKeys.TopLevel).ToDictionary(e => e.Key, e => e.Value);

        var versionNode = r.Require(root, ContractKeys.Version, "The contract");
        var version = r.Integer(versionNode, ContractKeys.Version);
        if (version != SupportedVersion)
            throw r.Error(ErrorCodes.ContractVersion, versionNode,
                $"Contract version {version} is not supported; this GateTasks reads version {SupportedVersion}.");

        var title = top.TryGetValue(ContractKeys.Title, out var t) ? r.String(t, ContractKeys.Title) : null;
        var sample = ReadSample(r, r.Require(root, ContractKeys.Sample, "The contract"));
        var referenceNode = r.Require(root, ContractKeys.Reference, "The contract");
        var reference = r.String(referenceNode, ContractKeys.Reference);

        var decision = top.TryGetValue(ContractKeys.Decision, out var dn) ? ReadDecision(r, dn) : DecisionSettings.Default;
        var defaults = top.TryGetValue(ContractKeys.Defaults, out var d)
            ? ReadDefaults(r, d)
            : new FeatureSettings(null, null, new CheckTable(), null);

        var featuresNode = r.Sequence(r.Require(root, ContractKeys.Features, "The contract"), ContractKeys.Features);
        if (featuresNode.Children.Count == 0)
            throw r.Error(ErrorCodes.ContractBadValue, featuresNode, "The contract lists no features; a gate with nothing to check would always pass.");

        var features = new List<FeatureSpec>();
        var seen = new Dictionary<string, SourceLocation>(StringComparer.Ordinal);
        foreach (var item in featuresNode.Children)
        {
            var parent = ReadFeature(r, item, defaults);
            var block = item is YamlMappingNode m && YamlNodeReader.Find(m, ContractKeys.Categories) is { } categoriesNode ? ReadCategories(r, categoriesNode, parent) : [];
            foreach (var feature in block.Prepend(parent))
            {
                if (seen.TryGetValue(feature.Name, out var first))
                    throw new GateInputException(ErrorCodes.ContractDuplicateFeature,
                        $"Feature '{feature.Name}' is listed twice; the first is at line {first.Line}.", feature.Location);
                seen.Add(feature.Name, feature.Location);
                features.Add(feature);
            }
        }

        var correlations = top.TryGetValue(ContractKeys.Correlations, out var cn) ? ReadCorrelations(r, cn, features) : [];
        var selection = top.TryGetValue(ContractKeys.Selection, out var sn)
            ? new SelectionSpec(r.String(sn, ContractKeys.Selection), ExpressionStart(r, sn))
            : null;
        var joint = top.TryGetValue(ContractKeys.Joint, out var jn) ? ReadJoint(r, jn, features) : null;
        var acceptance = top.TryGetValue(ContractKeys.Acceptance, out var an) ? ReadAcceptance(r, an, path) : null;
        return new PrecisionContract(path, version, title, sample, reference, r.At(referenceNode), decision, features, correlations, selection, joint, acceptance);
    }

    private static string InnerMessage(YamlException e) => e.InnerException is YamlException inner ? inner.Message : e.Message;

    private static SampleSpec ReadSample(YamlNodeReader r, YamlNode node)
    {
        if (node is YamlScalarNode)
            return new SampleSpec(r.String(node, ContractKeys.Sample), r.At(node), null, null);
        var mapping = r.Mapping(node, ContractKeys.Sample);
        var entries = r.Entries(mapping, ContractKeys.Sample, ContractKeys.SampleKeys);
        var pathNode = r.Require(mapping, ContractKeys.Path, ContractKeys.Sample);
        var weightNode = entries.FirstOrDefault(e => e.Key == ContractKeys.Weight).Value;
        return new SampleSpec(
            r.String(pathNode, "sample.path"), r.At(pathNode),
            weightNode is null ? null : r.String(weightNode, "sample.weight"),
            weightNode is null ? null : r.At(weightNode));
    }

    /// <summary>Where an expression's first character is: one column further for a quoted scalar, so error carets land on the token.</summary>
    private static SourceLocation ExpressionStart(YamlNodeReader r, YamlNode node)
    {
        var at = r.At(node);
        return node is YamlScalarNode { Style: YamlDotNet.Core.ScalarStyle.DoubleQuoted or YamlDotNet.Core.ScalarStyle.SingleQuoted }
            ? at with { Column = at.Column + 1 }
            : at;
    }

    private static List<NamedRegion> ReadRegions(YamlNodeReader r, YamlNode node, string what)
    {
        var list = new List<NamedRegion>();
        foreach (var (keyNode, value) in r.Mapping(node, what).Children)
        {
            var name = r.String(keyNode, "A region name");
            if (name is ContractKeys.Core or ContractKeys.Tails or "all")
                throw r.Error(ErrorCodes.ContractBadValue, keyNode, $"'{name}' is a built-in region; pick another name.");
            if (value is YamlSequenceNode)
            {
                var (lo, hi) = Pair(r, value, $"region '{name}'");
                list.Add(new NamedRegion(name, lo, hi, false, r.At(keyNode)));
                continue;
            }
            var m = r.Mapping(value, $"region '{name}'");
            var e = r.Entries(m, $"region '{name}'", ContractKeys.NamedRegionKeys).ToDictionary(x => x.Key, x => x.Value);
            if (e.Count != 1) throw r.Error(ErrorCodes.ContractBadValue, value, $"Region '{name}' takes either 'range: [lower, upper]' or 'quantiles: [p, q]'.");
            if (e.TryGetValue(ContractKeys.Range, out var range))
            {
                var (lo, hi) = Pair(r, range, $"region '{name}'");
                list.Add(new NamedRegion(name, lo, hi, false, r.At(keyNode)));
            }
            else
            {
                var (lo, hi) = Pair(r, e[ContractKeys.Quantiles], $"the quantiles of region '{name}'");
                if (lo < 0 || hi > 1) throw r.Error(ErrorCodes.ContractBadValue, e[ContractKeys.Quantiles], "Quantiles must lie within [0, 1].");
                list.Add(new NamedRegion(name, lo, hi, true, r.At(keyNode)));
            }
        }
        return list;
    }

    /// <summary>
    /// A category block: the feature's checks repeated for each category of a discrete column or expression, each
    /// category a feature of its own with that condition; with fraction-max, the categories' population fractions
    /// are checked as one more (discrete) feature.
    /// </summary>
    private static List<FeatureSpec> ReadCategories(YamlNodeReader r, YamlNode node, FeatureSpec parent)
    {
        var mapping = r.Mapping(node, $"The categories of feature '{parent.Name}'");
        var e = r.Entries(mapping, "categories", ContractKeys.CategoryKeys).ToDictionary(x => x.Key, x => x.Value);
        var byNode = r.Require(mapping, ContractKeys.By, "categories");
        var by = r.String(byNode, "categories.by");
        var byAt = ExpressionStart(r, byNode);
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
                new BinningSpec(BinningMode.Categories, 0, 0, 0, [], byAt), parent.Core,
                [new CheckSpec(CheckKind.Fraction, Region.All, tolerance, r.At(fn))], r.At(byNode), byAt, Expression: by));
        }
        return list;
    }

    private static JointSpec ReadJoint(YamlNodeReader r, YamlNode node, IReadOnlyList<FeatureSpec> features)
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
        return new JointSpec(list, subsample, permutations, new CheckSpec(CheckKind.EnergyTest, Region.All, double.NaN, r.At(testNode)), r.At(node));
    }

    private static List<CorrelationSpec> ReadCorrelations(YamlNodeReader r, YamlNode node, IReadOnlyList<FeatureSpec> features)
    {
        var list = new List<CorrelationSpec>();
        var names = features.Select(f => f.Name).ToList();
        foreach (var item in r.Sequence(node, ContractKeys.Correlations).Children)
        {
            var mapping = r.Mapping(item, "A correlation entry");
            var entries = r.Entries(mapping, "a correlation entry", ContractKeys.CorrelationKeys).ToDictionary(e => e.Key, e => e.Value);
            var featuresNode = r.Require(mapping, ContractKeys.PairFeatures, "A correlation entry");
            var group = ReadCorrelationGroup(r, featuresNode, names);
            CheckSpec? Tolerance(string key, CheckKind kind)
            {
                if (!entries.TryGetValue(key, out var v)) return null;
                var t = r.Number(v, key);
                if (!(t > 0 && t <= 2)) throw r.Error(ErrorCodes.ContractBadValue, v, $"{key} must be in (0, 2], got {t}.");
                return new CheckSpec(kind, Region.All, t, r.At(v));
            }
            var pearson = Tolerance(ContractKeys.PearsonMax, CheckKind.PearsonDifference);
            var spearman = Tolerance(ContractKeys.SpearmanMax, CheckKind.SpearmanDifference);
            CheckSpec? chi2 = null;
            if (entries.TryGetValue(ContractKeys.Chi2Test2D, out var cv))
            {
                if (!YamlNodeReader.IsScalar(cv, ContractKeys.On) && !YamlNodeReader.IsScalar(cv, ContractKeys.Off))
                    throw r.Error(ErrorCodes.ContractBadValue, cv, $"{ContractKeys.Chi2Test2D} is a test without a tolerance: write 'on' or 'off'.");
                if (YamlNodeReader.IsScalar(cv, ContractKeys.On)) chi2 = new CheckSpec(CheckKind.ChiSquare2DTest, Region.All, double.NaN, r.At(cv));
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
    private static List<string> ReadCorrelationGroup(YamlNodeReader r, YamlNode node, List<string> names)
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

    private static AcceptanceSettings ReadAcceptance(YamlNodeReader r, YamlNode node, string path)
    {
        var mapping = r.Mapping(node, ContractKeys.Acceptance);
        var a = AcceptanceSettings.Default(path) with { Location = r.At(node) };
        foreach (var (key, _, value) in r.Entries(mapping, ContractKeys.Acceptance, ContractKeys.AcceptanceKeys))
        {
            bool Switch(string what)
            {
                if (YamlNodeReader.IsScalar(value, ContractKeys.On)) return true;
                if (YamlNodeReader.IsScalar(value, ContractKeys.Off)) return false;
                throw r.Error(ErrorCodes.ContractBadValue, value, $"{what} takes 'on' or 'off'.");
            }
            switch (key)
            {
                case ContractKeys.Ledger:
                    var ledger = r.String(value, "acceptance.ledger");
                    if (ledger.Length == 0) throw r.Error(ErrorCodes.ContractBadValue, value, "acceptance.ledger needs a file name.");
                    a = a with { LedgerPath = ledger, LedgerLocation = r.At(value) };
                    break;
                case ContractKeys.Required:
                    a = a with { Required = Switch("acceptance.required") };
                    break;
                case ContractKeys.Tightening:
                    var policy = r.String(value, "acceptance.tightening");
                    if (!ContractKeys.TighteningPolicies.Contains(policy))
                        throw r.Error(ErrorCodes.ContractBadValue, value,
                            $"acceptance.tightening is 'free' (tightening needs no entry) or 'record', got '{policy}'{NearestName.Hint(policy, ContractKeys.TighteningPolicies)}.");
                    a = a with { RecordTightening = policy == "record" };
                    break;
                case ContractKeys.Ratchet:
                    a = a with { Ratchet = Switch("acceptance.ratchet") };
                    break;
            }
        }
        return a;
    }

    private static DecisionSettings ReadDecision(YamlNodeReader r, YamlNode node)
    {
        var mapping = r.Mapping(node, ContractKeys.Decision);
        var d = DecisionSettings.Default with { Location = r.At(node) };
        foreach (var (key, _, value) in r.Entries(mapping, ContractKeys.Decision, ContractKeys.DecisionKeys))
        {
            switch (key)
            {
                case ContractKeys.Confidence:
                    var c = r.Number(value, "decision.confidence");
                    if (!(c >= 0.5 && c < 1)) throw r.Error(ErrorCodes.ContractBadValue, value, $"decision.confidence must be in [0.5, 1), got {c}.");
                    d = d with { Confidence = c };
                    break;
                case ContractKeys.FalseAlarm:
                    var a = r.Number(value, "decision.false-alarm");
                    if (!(a > 0 && a < 0.5)) throw r.Error(ErrorCodes.ContractBadValue, value, $"decision.false-alarm must be in (0, 0.5), got {a}.");
                    d = d with { FalseAlarm = a };
                    break;
                case ContractKeys.Correction:
                    d = d with
                    {
                        Correction = r.OneOf(value, "decision.correction", ContractKeys.Corrections) switch
                        {
                            "benjamini-hochberg" => Statistics.MultipleTestingMethod.BenjaminiHochberg,
                            "bonferroni" => Statistics.MultipleTestingMethod.Bonferroni,
                            _ => Statistics.MultipleTestingMethod.Holm,
                        },
                    };
                    break;
                case ContractKeys.Inconclusive:
                    d = d with { InconclusiveFails = r.OneOf(value, "decision.inconclusive", ContractKeys.InconclusivePolicies) == "fail" };
                    break;
            }
        }
        return d;
    }

    private static FeatureSettings ReadDefaults(YamlNodeReader r, YamlNode node)
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
                case ContractKeys.Binning: binning = ReadBinning(r, value, "defaults.binning"); break;
                case ContractKeys.Core: core = ReadCore(r, value, "defaults.core"); break;
                case ContractKeys.Regions: regions = ReadRegions(r, value, "defaults.regions"); break;
                case ContractKeys.Checks: ReadChecks(r, value, "defaults.checks", checks); break;
                case ContractKeys.NonFinite: nonFinite = ReadNonFinite(r, value, "defaults.non-finite"); break;
            }
        }
        return new FeatureSettings(binning, core, checks, regions, nonFinite);
    }

    private static FeatureSpec ReadFeature(YamlNodeReader r, YamlNode node, FeatureSettings defaults)
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
            expression = r.String(expressionNode, $"The expression of {what}");
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
            binning = new BinningSpec(BinningMode.Categories, 0, 0, 0, [], r.At(nameNode));
        }
        else
        {
            binning = entries.TryGetValue(ContractKeys.Binning, out var b)
                ? ReadBinning(r, b, $"The binning of {what}")
                : defaults.Binning ?? new BinningSpec(BinningMode.Quantile, DefaultBins, 0, 0, [], r.At(nameNode));
        }

        var core = entries.TryGetValue(ContractKeys.Core, out var c)
            ? ReadCore(r, c, $"The core of {what}")
            : defaults.Core ?? Central(DefaultCoreFraction, r.At(nameNode));

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
        if (entries.TryGetValue(ContractKeys.Checks, out var ch)) ReadChecks(r, ch, $"the checks of {what}", checks);
        var regionsOfFeature = entries.TryGetValue(ContractKeys.Regions, out var rn) ? ReadRegions(r, rn, $"The regions of {what}") : defaults.Regions ?? [];
        var list = checks.ToList();
        foreach (var named in list.Where(k => k.Region == Region.Named))
        {
            if (regionsOfFeature.All(g => g.Name != named.Named))
                throw new GateInputException(ErrorCodes.ContractUnknownKey,
                    $"{what} declares no region '{named.Named}'{NearestName.Hint(named.Named!, regionsOfFeature.Select(g => g.Name).Append(ContractKeys.Core).Append(ContractKeys.Tails))}; " +
                    "declare it under 'regions:' (or use core / tails).", named.NamedKeyLocation ?? named.Location);
        }
        if (kind == FeatureKind.Discrete && list.FirstOrDefault(c => c.Kind is CheckKind.FarTail) is { } continuousOnly)
            throw new GateInputException(ErrorCodes.ContractBadValue,
                $"{continuousOnly.Key} counts events beyond quantiles, which a discrete feature ('{name}') does not have.", continuousOnly.Location);
        if (list.Count == 0)
            throw r.Error(ErrorCodes.ContractBadValue, nameNode,
                $"{char.ToUpperInvariant(what[0])}{what[1..]} has no checks (none of its own, none in defaults); it would always pass.");

        var nonFinite = entries.TryGetValue(ContractKeys.NonFinite, out var nf) ? ReadNonFinite(r, nf, $"The non-finite setting of {what}") : defaults.NonFinite;
        return new FeatureSpec(name, column, kind, binning, core, list, r.At(nameNode), ExpressionStart(r, columnNode), spike, expression, regionsOfFeature)
        {
            AllowNonFinite = nonFinite?.Allow ?? false,
            NonFiniteLocation = nonFinite?.Location,
        };
    }

    private static (bool Allow, SourceLocation Location) ReadNonFinite(YamlNodeReader r, YamlNode node, string what) =>
        (r.OneOf(node, what, ContractKeys.NonFinitePolicies) == "allow", r.At(node));

    private static BinningSpec ReadBinning(YamlNodeReader r, YamlNode node, string what)
    {
        var mapping = r.Mapping(node, what);
        var e = r.Entries(mapping, "binning", ContractKeys.BinningKeys).ToDictionary(x => x.Key, x => x.Value);
        var at = r.At(node);
        if (e.TryGetValue(ContractKeys.Edges, out var edgesNode))
        {
            foreach (var other in new[] { ContractKeys.Bins, ContractKeys.Spacing, ContractKeys.Range })
                if (e.ContainsKey(other))
                    throw r.Error(ErrorCodes.ContractBadValue, e[other], $"'{other}' cannot be combined with explicit 'edges'.");
            var seq = r.Sequence(edgesNode, "edges");
            var edges = seq.Children.Select(n => r.Number(n, "An edge")).ToList();
            if (edges.Count < 2) throw r.Error(ErrorCodes.ContractBadValue, edgesNode, "edges needs at least two values.");
            for (var i = 1; i < edges.Count; i++)
                if (!(edges[i] > edges[i - 1]))
                    throw r.Error(ErrorCodes.ContractBadValue, seq.Children[i], $"edges must increase strictly; {edges[i]} follows {edges[i - 1]}.");
            return new BinningSpec(BinningMode.Edges, edges.Count - 1, edges[0], edges[^1], edges, at);
        }

        var bins = DefaultBins;
        if (e.TryGetValue(ContractKeys.Bins, out var binsNode))
        {
            bins = r.Integer(binsNode, "bins");
            if (bins < 1 || bins > MaxBins) throw r.Error(ErrorCodes.ContractBadValue, binsNode, $"bins must be between 1 and {MaxBins}, got {bins}.");
        }
        var spacing = e.TryGetValue(ContractKeys.Spacing, out var sp)
            ? r.OneOf(sp, "spacing", ContractKeys.Spacings)
            : e.ContainsKey(ContractKeys.Range) ? "uniform" : "quantile";
        if (spacing == "quantile")
        {
            if (e.TryGetValue(ContractKeys.Range, out var rn))
                throw r.Error(ErrorCodes.ContractBadValue, rn, "Quantile spacing takes its range from the reference; drop 'range' or use spacing: uniform.");
            return new BinningSpec(BinningMode.Quantile, bins, 0, 0, [], at);
        }
        if (!e.TryGetValue(ContractKeys.Range, out var rangeNode))
            throw r.Error(ErrorCodes.ContractMissingKey, node, "Uniform spacing needs 'range: [lower, upper]'.");
        var (lo, hi) = Pair(r, rangeNode, "range");
        return new BinningSpec(BinningMode.Uniform, bins, lo, hi, [], at);
    }

    private static (double Lower, double Upper) Pair(YamlNodeReader r, YamlNode node, string what)
    {
        var seq = r.Sequence(node, what);
        if (seq.Children.Count != 2) throw r.Error(ErrorCodes.ContractBadValue, node, $"{what} must be two numbers, [lower, upper].");
        var lo = r.Number(seq.Children[0], $"The lower end of {what}");
        var hi = r.Number(seq.Children[1], $"The upper end of {what}");
        if (!(hi > lo)) throw r.Error(ErrorCodes.ContractBadValue, node, $"{what} must have upper > lower, got [{lo}, {hi}].");
        return (lo, hi);
    }

    private static CoreSpec Central(double fraction, SourceLocation at) => new((1 - fraction) / 2, (1 + fraction) / 2, at);

    private static CoreSpec ReadCore(YamlNodeReader r, YamlNode node, string what)
    {
        if (node is YamlSequenceNode)
        {
            var (lo, hi) = Pair(r, node, what);
            if (lo < 0 || hi > 1) throw r.Error(ErrorCodes.ContractBadValue, node, $"{what} as quantiles must lie within [0, 1].");
            return new CoreSpec(lo, hi, r.At(node));
        }
        var f = r.Number(node, what);
        if (!(f > 0 && f < 1))
            throw r.Error(ErrorCodes.ContractBadValue, node, $"{what} is the central fraction of the reference and must be in (0, 1), got {f}.");
        return Central(f, r.At(node));
    }

    private static void ReadChecks(YamlNodeReader r, YamlNode node, string what, CheckTable checks)
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
                checks.Remove(kind, Region.All);
                foreach (var (keyNode, v) in regions.Children)
                {
                    var region = r.String(keyNode, $"A region of {key}");
                    var reg = region == ContractKeys.Core ? Region.Core : region == ContractKeys.Tails ? Region.Tails : Region.Named;
                    var named = reg == Region.Named ? region : null;
                    // Named regions are checked against the feature's declarations once defaults and feature are merged.
                    if (YamlNodeReader.IsScalar(v, ContractKeys.Off)) checks.Remove(kind, reg, named);
                    else checks.Set(new CheckSpec(kind, reg, Tolerance(r, v, kind, $"{key}.{region}"), r.At(v), named) { NamedKeyLocation = r.At(keyNode) });
                }
                continue;
            }
            checks.RemoveAll(kind);
            if (new CheckSpec(kind, Region.All, double.NaN, r.At(value)).IsTest)
            {
                if (!YamlNodeReader.IsScalar(value, ContractKeys.On))
                    throw r.Error(ErrorCodes.ContractBadValue, value, $"{key} is a goodness-of-fit test without a tolerance: write 'on' or 'off'.");
                checks.Set(new CheckSpec(kind, Region.All, double.NaN, r.At(value)));
                continue;
            }
            checks.Set(new CheckSpec(kind, Region.All, Tolerance(r, value, kind, key), r.At(value)));
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

    private sealed record FeatureSettings(BinningSpec? Binning, CoreSpec? Core, CheckTable Checks, List<NamedRegion>? Regions = null,
        (bool Allow, SourceLocation Location)? NonFinite = null);

    /// <summary>Checks keyed by (kind, region), kept in report order; features copy the defaults and override entries.</summary>
    private sealed class CheckTable
    {
        private readonly Dictionary<(CheckKind, Region, string?), CheckSpec> _items = [];

        public CheckTable Copy()
        {
            var c = new CheckTable();
            foreach (var (k, v) in _items) c._items[k] = v;
            return c;
        }

        public void Set(CheckSpec spec) => _items[(spec.Kind, spec.Region, spec.Named)] = spec;

        public void Remove(CheckKind kind, Region region, string? named = null) => _items.Remove((kind, region, named));

        public void RemoveAll(CheckKind kind)
        {
            foreach (var key in _items.Keys.Where(k => k.Item1 == kind).ToList()) _items.Remove(key);
        }

        public List<CheckSpec> ToList() =>
            _items.Values.OrderBy(c => c.Kind).ThenBy(c => c.Region).ThenBy(c => c.Named, StringComparer.Ordinal).ToList();
    }
}
