using System.Text.Json;
using GateTasks.Engine.References;

namespace GateTasks.Benchmarks.Harness;

/// <summary>
/// Writes what the independent engines need from a reference file as JSON: per feature its bin edges and its cells
/// (Σw for underflow, bins, overflow), so every tool bins with exactly the edges the check uses.
/// </summary>
internal static class ReferenceExport
{
    public static void Write(string referencePath, string jsonPath)
    {
        var reference = ReferenceFile.Read(referencePath);
        using var stream = File.Create(jsonPath);
        using var json = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true });
        json.WriteStartObject();
        json.WriteNumber("events", reference.Events);
        json.WriteStartObject("features");
        foreach (var feature in reference.Features)
        {
            var histogram = feature.Histogram;
            json.WriteStartObject(feature.Name);
            json.WriteString("column", feature.Column);
            json.WriteString("axis", histogram.Axis.GetType().Name);
            // Edges written with round-trip precision: the other tools must compare against the same doubles.
            json.WriteStartArray("edges");
            foreach (var e in histogram.Axis.Edges) json.WriteNumberValue(e);
            json.WriteEndArray();
            json.WriteStartArray("cells");
            foreach (var w in histogram.SumW) json.WriteNumberValue(w);
            json.WriteEndArray();
            json.WriteEndObject();
        }
        json.WriteEndObject();
        json.WriteEndObject();
    }
}
