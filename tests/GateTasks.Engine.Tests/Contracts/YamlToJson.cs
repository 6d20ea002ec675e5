using System.Globalization;
using System.Text.Json.Nodes;
using YamlDotNet.RepresentationModel;

namespace GateTasks.Engine.Tests.Contracts;

/// <summary>Turns a YAML document into JSON with YAML 1.2 core-schema scalar typing, so a JSON Schema can judge it.</summary>
internal static class YamlToJson
{
    public static JsonNode? Convert(string yaml)
    {
        var stream = new YamlStream();
        stream.Load(new StringReader(yaml));
        return Node(stream.Documents[0].RootNode);
    }

    private static JsonNode? Node(YamlNode node) => node switch
    {
        YamlMappingNode m => new JsonObject(m.Children.Select(kv =>
            KeyValuePair.Create(((YamlScalarNode)kv.Key).Value!, Node(kv.Value)))),
        YamlSequenceNode s => new JsonArray(s.Children.Select(Node).ToArray()),
        YamlScalarNode { Style: YamlDotNet.Core.ScalarStyle.Plain } p => Plain(p.Value ?? ""),
        YamlScalarNode q => JsonValue.Create(q.Value),
        _ => null,
    };

    private static JsonNode? Plain(string v)
    {
        if (v is "" or "~" or "null") return null;
        if (v is "true") return JsonValue.Create(true);
        if (v is "false") return JsonValue.Create(false);
        if (long.TryParse(v, NumberStyles.Integer, CultureInfo.InvariantCulture, out var l)) return JsonValue.Create(l);
        if (double.TryParse(v, NumberStyles.Float, CultureInfo.InvariantCulture, out var d)) return JsonValue.Create(d);
        return JsonValue.Create(v);
    }
}
