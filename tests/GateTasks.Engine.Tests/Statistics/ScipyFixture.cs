using System.Text.Json;

namespace GateTasks.Engine.Tests.Statistics;

/// <summary>
/// Reads tests/fixtures/scipy/statistics.json, written by tests/fixtures/scipy/make_fixtures.py with
/// Debian's python3-scipy 1.10.1 / numpy 1.24.2; every case records the exact call that produced it.
/// </summary>
internal static class ScipyFixture
{
    private static readonly Lazy<JsonDocument> Document = new(() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "scipy", "statistics.json"))));

    internal static JsonElement Root => Document.Value.RootElement;

    internal static JsonElement Section(string name) => Root.GetProperty(name);

    internal static JsonElement Case(string section, string name)
    {
        foreach (JsonElement c in Section(section).EnumerateArray())
        {
            if (c.GetProperty("name").GetString() == name)
                return c;
        }
        throw new KeyNotFoundException($"Fixture case {section}/{name} not found.");
    }

    internal static IEnumerable<string> CaseNames(string section) =>
        Section(section).EnumerateArray().Select(c => c.GetProperty("name").GetString()!);

    internal static double[] Doubles(this JsonElement element, string property) =>
        element.GetProperty(property).EnumerateArray().Select(e => e.GetDouble()).ToArray();

    internal static double Double(this JsonElement element, string property) => element.GetProperty(property).GetDouble();

    /// <summary>Asserts |actual − expected| ≤ relative·|expected| + absolute.</summary>
    internal static void Near(double expected, double actual, double relative, double absolute = 0)
    {
        double tolerance = relative * Math.Abs(expected) + absolute;
        Assert.True(Math.Abs(actual - expected) <= tolerance,
            FormattableString.Invariant($"expected {expected:R}, got {actual:R} (difference {actual - expected:R}, tolerance {tolerance:R})"));
    }
}
