using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using YamlDotNet.Core;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads a precision contract (YAML, schema version 1) into a <see cref="PrecisionContract"/>: the file, its shape
/// and its top-level keys here, each section by its own reader (<see cref="SampleSpecReader"/>,
/// <see cref="DecisionSettingsReader"/>, <see cref="FeatureDefaults"/>, <see cref="FeatureSpecReader"/>,
/// <see cref="CorrelationSpecReader"/>, <see cref="JointSpecReader"/>, <see cref="AcceptanceSettingsReader"/>), the
/// defaults block applied to every feature. Every problem is a <see cref="GateInputException"/> at the offending
/// line and column; nothing is silently ignored.
/// </summary>
internal static class ContractLoader
{
    public const int SupportedVersion = 1;

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
        var root = r.Mapping(Document(text, path).RootNode, "The contract");
        var top = r.Entries(root, "the contract", ContractKeys.TopLevel).ToDictionary(e => e.Key, e => e.Value);

        var versionNode = r.Require(root, ContractKeys.Version, "The contract");
        var version = r.Integer(versionNode, ContractKeys.Version);
        if (version != SupportedVersion)
            throw r.Error(ErrorCodes.ContractVersion, versionNode,
                $"Contract version {version} is not supported; this GateTasks reads version {SupportedVersion}.");

        var title = top.TryGetValue(ContractKeys.Title, out var t) ? r.String(t, ContractKeys.Title) : null;
        var sample = SampleSpecReader.Read(r, r.Require(root, ContractKeys.Sample, "The contract"));
        var referenceNode = r.Require(root, ContractKeys.Reference, "The contract");
        var reference = r.String(referenceNode, ContractKeys.Reference);

        var decision = top.TryGetValue(ContractKeys.Decision, out var dn) ? DecisionSettingsReader.Read(r, dn) : DecisionSettings.Default;
        var defaults = top.TryGetValue(ContractKeys.Defaults, out var d) ? FeatureDefaults.Read(r, d) : FeatureDefaults.None;
        var features = ReadFeatures(r, r.Require(root, ContractKeys.Features, "The contract"), defaults);

        var correlations = top.TryGetValue(ContractKeys.Correlations, out var cn) ? CorrelationSpecReader.Read(r, cn, features) : [];
        var selection = top.TryGetValue(ContractKeys.Selection, out var sn) ? SampleSpecReader.ReadSelection(r, sn) : null;
        var joint = top.TryGetValue(ContractKeys.Joint, out var jn) ? JointSpecReader.Read(r, jn, features) : null;
        var acceptance = top.TryGetValue(ContractKeys.Acceptance, out var an) ? AcceptanceSettingsReader.Read(r, an, path) : null;
        return new PrecisionContract(path, version, title, sample, reference, r.At(referenceNode), decision, features, correlations, selection, joint, acceptance);
    }

    /// <summary>The contract's one YAML document, its shape checked (<see cref="YamlShapeGuard"/>) before it is loaded into nodes.</summary>
    private static YamlDocument Document(string text, string path)
    {
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
        return stream.Documents[0];
    }

    private static string InnerMessage(YamlException e) => e.InnerException is YamlException inner ? inner.Message : e.Message;

    /// <summary>The features list: each feature, then the features of its category block, every name once.</summary>
    private static List<FeatureSpec> ReadFeatures(YamlNodeReader r, YamlNode node, FeatureDefaults defaults)
    {
        var featuresNode = r.Sequence(node, ContractKeys.Features);
        if (featuresNode.Children.Count == 0)
            throw r.Error(ErrorCodes.ContractBadValue, featuresNode, "The contract lists no features; a gate with nothing to check would always pass.");

        var features = new List<FeatureSpec>();
        var seen = new Dictionary<string, SourceLocation>(StringComparer.Ordinal);
        foreach (var item in featuresNode.Children)
        {
            var parent = FeatureSpecReader.Read(r, item, defaults);
            var block = item is YamlMappingNode m && YamlNodeReader.Find(m, ContractKeys.Categories) is { } categoriesNode
                ? CategoryBlockReader.Read(r, categoriesNode, parent)
                : [];
            foreach (var feature in block.Prepend(parent))
            {
                if (seen.TryGetValue(feature.Name, out var first))
                    throw new GateInputException(ErrorCodes.ContractDuplicateFeature,
                        $"Feature '{feature.Name}' is listed twice; the first is at line {first.Line}.", feature.Location);
                seen.Add(feature.Name, feature.Location);
                features.Add(feature);
            }
        }
        return features;
    }
}
