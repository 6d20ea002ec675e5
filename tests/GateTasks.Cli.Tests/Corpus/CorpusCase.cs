using YamlDotNet.RepresentationModel;

namespace GateTasks.Cli.Tests.Corpus;

/// <summary>One case of tests/corpus: what it prepares, what it runs and what it expects (tests/corpus/README.md).</summary>
public sealed record CorpusCase(string Name, string Folder, string About, IReadOnlyList<YamlMappingNode> Prepare,
    IReadOnlyList<string> Run, CorpusExpectation Expect)
{
    /// <summary>The cases, in folder order.</summary>
    public static IReadOnlyList<CorpusCase> All { get; } = Directory
        .GetDirectories(Path.Combine(GateTasks.Tests.Shared.RepositoryRoot.Path, "tests", "corpus"))
        .Where(d => Path.GetFileName(d) != "base")
        .Order(StringComparer.Ordinal)
        .Select(Load)
        .ToList();

    /// <summary>The folder holding the files every case starts from.</summary>
    public static string BaseFolder => Path.Combine(GateTasks.Tests.Shared.RepositoryRoot.Path, "tests", "corpus", "base");

    private static CorpusCase Load(string folder)
    {
        var stream = new YamlStream();
        stream.Load(new StringReader(File.ReadAllText(Path.Combine(folder, "case.yaml"))));
        var root = (YamlMappingNode)stream.Documents[0].RootNode;
        var prepare = root.Children.TryGetValue("prepare", out var p) ? ((YamlSequenceNode)p).Children.Cast<YamlMappingNode>().ToList() : [];
        var run = ((YamlSequenceNode)root["run"]).Children.Select(Text).ToList();
        var e = (YamlMappingNode)root["expect"];
        string? Optional(string key) => e.Children.TryGetValue(key, out var v) ? Text(v) : null;
        var expect = new CorpusExpectation(
            int.Parse(Text(e["exit"]), System.Globalization.CultureInfo.InvariantCulture),
            Optional("code"), Optional("file"),
            Optional("line") is { } line ? int.Parse(line, System.Globalization.CultureInfo.InvariantCulture) : null,
            Optional("column") is { } column ? int.Parse(column, System.Globalization.CultureInfo.InvariantCulture) : null,
            Text(e["says"]));
        return new CorpusCase(Path.GetFileName(folder), folder, Text(root["about"]), prepare, run, expect);
    }

    internal static string Text(YamlNode node) => ((YamlScalarNode)node).Value ?? "";

    public override string ToString() => Name;
}

/// <summary>What a corpus case must give: exit code, error code, where, and a phrase of the message.</summary>
public sealed record CorpusExpectation(int Exit, string? Code, string? File, int? Line, int? Column, string Says);
