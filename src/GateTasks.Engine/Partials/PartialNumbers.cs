using System.Globalization;
using System.Text.Json;

namespace GateTasks.Engine.Partials;

/// <summary>
/// Doubles in a partial file: finite ones as JSON numbers (System.Text.Json writes the shortest round-trip form),
/// NaN and ±∞ — which JSON has no numbers for — as the strings "NaN", "Infinity", "-Infinity". Read back bit for bit.
/// </summary>
internal static class PartialNumbers
{
    public static void Write(Utf8JsonWriter w, double v)
    {
        if (double.IsFinite(v)) w.WriteNumberValue(v);
        else w.WriteStringValue(v.ToString(CultureInfo.InvariantCulture));
    }

    public static void WriteArray(Utf8JsonWriter w, string name, IEnumerable<double> values)
    {
        w.WriteStartArray(name);
        foreach (var v in values) Write(w, v);
        w.WriteEndArray();
    }

    public static void WriteJagged(Utf8JsonWriter w, string name, IEnumerable<IReadOnlyList<double>> rows)
    {
        w.WriteStartArray(name);
        foreach (var row in rows)
        {
            w.WriteStartArray();
            foreach (var v in row) Write(w, v);
            w.WriteEndArray();
        }
        w.WriteEndArray();
    }

    public static double Read(JsonElement e) => e.ValueKind == JsonValueKind.String
        ? double.Parse(e.GetString()!, NumberStyles.Float, CultureInfo.InvariantCulture)
        : e.GetDouble();

    public static double[] ReadArray(JsonElement e) => e.EnumerateArray().Select(Read).ToArray();

    public static double[][] ReadJagged(JsonElement e) => e.EnumerateArray().Select(ReadArray).ToArray();
}
