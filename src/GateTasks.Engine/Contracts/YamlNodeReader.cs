using System.Globalization;
using GateTasks.Engine.Diagnostics;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Reads typed values out of YAML nodes and turns every mismatch into a <see cref="GateInputException"/>
/// that names the file, line and column, so contract errors are as precise as compiler errors.
/// </summary>
internal sealed class YamlNodeReader(string file)
{
    public string File { get; } = file;

    public SourceLocation At(YamlNode node) => new(File, (int)node.Start.Line, (int)node.Start.Column);

    public GateInputException Error(string code, YamlNode node, string message) => new(code, message, At(node));

    public YamlMappingNode Mapping(YamlNode node, string what) =>
        node as YamlMappingNode ?? throw Error(ErrorCodes.ContractBadValue, node, $"{what} must be a mapping of keys to values.");

    public YamlSequenceNode Sequence(YamlNode node, string what) =>
        node as YamlSequenceNode ?? throw Error(ErrorCodes.ContractBadValue, node, $"{what} must be a list.");

    public YamlScalarNode Scalar(YamlNode node, string what) =>
        node as YamlScalarNode ?? throw Error(ErrorCodes.ContractBadValue, node, $"{what} must be a single value, not a list or mapping.");

    /// <summary>Key/value pairs of a mapping after rejecting keys outside <paramref name="allowed"/>, with a hint for the nearest one.</summary>
    public IReadOnlyList<(string Key, YamlNode KeyNode, YamlNode Value)> Entries(YamlMappingNode mapping, string what, IReadOnlyCollection<string> allowed)
    {
        var entries = new List<(string, YamlNode, YamlNode)>();
        foreach (var (keyNode, value) in mapping.Children)
        {
            var key = Scalar(keyNode, $"A key in {what}").Value ?? "";
            if (!allowed.Contains(key))
                throw Error(ErrorCodes.ContractUnknownKey, keyNode,
                    $"Unknown key '{key}' in {what}{NearestName.Hint(key, allowed)}. Allowed: {string.Join(", ", allowed)}.");
            entries.Add((key, keyNode, value));
        }
        return entries;
    }

    public static YamlNode? Find(YamlMappingNode mapping, string key)
    {
        foreach (var (k, v) in mapping.Children)
            if (k is YamlScalarNode s && s.Value == key) return v;
        return null;
    }

    public YamlNode Require(YamlMappingNode mapping, string key, string what) =>
        Find(mapping, key) ?? throw Error(ErrorCodes.ContractMissingKey, mapping, $"{what} needs the key '{key}'.");

    public string String(YamlNode node, string what)
    {
        var s = Scalar(node, what);
        if (string.IsNullOrWhiteSpace(s.Value)) throw Error(ErrorCodes.ContractBadValue, node, $"{what} must not be empty.");
        return s.Value;
    }

    /// <summary>
    /// An expression's text. An unquoted expression that starts with '{' (a column name in braces) is a mapping to YAML,
    /// and one that starts with '!' a tag; either is refused with the quoting that fixes it, rather than as a wrong type.
    /// </summary>
    public string Expression(YamlNode node, string what)
    {
        if (node is YamlMappingNode or YamlSequenceNode)
            throw Error(ErrorCodes.ExpressionNotQuotedInYaml, node,
                $"{what} was read by YAML as a {(node is YamlMappingNode ? "mapping" : "list")}, not as text: an expression that starts with " +
                $"'{(node is YamlMappingNode ? "{" : "[")}' must be in quotes, like \"{{jet pt}} > 20\".");
        if (node is YamlScalarNode { Style: YamlDotNet.Core.ScalarStyle.Plain } scalar && !scalar.Tag.IsEmpty)
            throw Error(ErrorCodes.ExpressionNotQuotedInYaml, node,
                $"{what} starts with '{scalar.Tag.Value}', which YAML reads as a tag, not as part of the text: an expression that starts with '!' " +
                "must be in quotes, like \"!(pt > 20)\".");
        return String(node, what);
    }

    public double Number(YamlNode node, string what)
    {
        var s = Scalar(node, what);
        if (!double.TryParse(s.Value, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) || !double.IsFinite(v))
            throw Error(ErrorCodes.ContractBadValue, node, $"{what} must be a finite number, got '{s.Value}'.");
        return v;
    }

    public int Integer(YamlNode node, string what)
    {
        var s = Scalar(node, what);
        if (!int.TryParse(s.Value, NumberStyles.Integer, CultureInfo.InvariantCulture, out var v))
            throw Error(ErrorCodes.ContractBadValue, node, $"{what} must be a whole number, got '{s.Value}'.");
        return v;
    }

    public string OneOf(YamlNode node, string what, IReadOnlyCollection<string> choices)
    {
        var v = String(node, what);
        if (!choices.Contains(v))
            throw Error(ErrorCodes.ContractBadValue, node,
                $"{what} must be one of {string.Join(", ", choices)}, got '{v}'{NearestName.Hint(v, choices)}.");
        return v;
    }

    public static bool IsScalar(YamlNode node, string value) => node is YamlScalarNode s && s.Value == value;

    /// <summary>A range written as two numbers, <c>[lower, upper]</c>, with upper &gt; lower.</summary>
    public (double Lower, double Upper) Interval(YamlNode node, string what)
    {
        var seq = Sequence(node, what);
        if (seq.Children.Count != 2) throw Error(ErrorCodes.ContractBadValue, node, $"{what} must be two numbers, [lower, upper].");
        var lo = Number(seq.Children[0], $"The lower end of {what}");
        var hi = Number(seq.Children[1], $"The upper end of {what}");
        if (!(hi > lo)) throw Error(ErrorCodes.ContractBadValue, node, $"{what} must have upper > lower, got [{lo}, {hi}].");
        return (lo, hi);
    }

    /// <summary>Where a text's (an expression's) first character is: one column further for a quoted scalar, so error carets land on the token.</summary>
    public SourceLocation TextStart(YamlNode node)
    {
        var at = At(node);
        return node is YamlScalarNode { Style: YamlDotNet.Core.ScalarStyle.DoubleQuoted or YamlDotNet.Core.ScalarStyle.SingleQuoted }
            ? at with { Column = at.Column + 1 }
            : at;
    }
}
