using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Contracts;

/// <summary>Reads which events the contract checks: the <c>sample</c> (a path, or a path and a weight column) and the <c>selection</c>.</summary>
internal static class SampleSpecReader
{
    /// <summary>The <c>sample</c> key: a path, or a mapping of <c>path</c> and an optional <c>weight</c>.</summary>
    public static SampleSpec Read(YamlNodeReader r, YamlNode node)
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

    /// <summary>The <c>selection</c> key: a condition every event must meet, located at its first character.</summary>
    public static SelectionSpec ReadSelection(YamlNodeReader r, YamlNode node) =>
        new(r.Expression(node, "The selection"), r.TextStart(node));
}
