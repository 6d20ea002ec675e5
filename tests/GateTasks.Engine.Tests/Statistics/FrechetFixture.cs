using System.Text.Json;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

/// <summary>
/// Reads tests/fixtures/scipy/frechet.json, written by tests/fixtures/scipy/make_frechet_fixtures.py with Debian's
/// python3-scipy 1.10.1 / numpy 1.24.2; each case records the exact calls that produced it.
/// </summary>
internal static class FrechetFixture
{
    private static readonly Lazy<JsonElement> Cases = new(() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "scipy", "frechet.json")))
            .RootElement.GetProperty("cases"));

    internal static JsonElement Case(string name) => Cases.Value.EnumerateArray().Single(c => c.GetProperty("name").GetString() == name);

    internal static double[] Numbers(this JsonElement c, string name) => c.GetProperty(name).EnumerateArray().Select(v => v.GetDouble()).ToArray();

    /// <summary>Side 1 or 2 of a case as feature columns (the fixture stores rows) and weights (empty: unit weights).</summary>
    internal static (double[][] Columns, double[] Weights) Side(JsonElement c, int side)
    {
        var d = c.GetProperty("d").GetInt32();
        var rows = c.Numbers($"x{side}");
        var n = rows.Length / d;
        var columns = new double[d][];
        for (var k = 0; k < d; k++)
        {
            columns[k] = new double[n];
            for (var i = 0; i < n; i++) columns[k][i] = rows[i * d + k];
        }
        var weights = c.TryGetProperty($"w{side}", out _) ? c.Numbers($"w{side}") : [];
        return (columns, weights);
    }

    /// <summary>Streams a side into <paramref name="blocks"/> blocks in batches of <paramref name="batch"/> rows (file rows from 0).</summary>
    internal static BlockedCovariance Accumulate(double[][] columns, double[] weights, int blocks, int batch)
    {
        var acc = new BlockedCovariance(columns.Length, blocks);
        Feed(acc, columns, weights, 0, columns[0].Length, batch, 0);
        return acc;
    }

    /// <summary>Feeds rows [from, to) of a file in batches, the file's first row having index <paramref name="fileRowOfFirst"/>.</summary>
    internal static void Feed(BlockedCovariance acc, double[][] columns, double[] weights, int from, int to, int batch, long fileRowOfFirst)
    {
        for (var start = from; start < to; start += batch)
        {
            var len = Math.Min(batch, to - start);
            var cols = columns.Select(col => new ReadOnlyMemory<double>(col, start, len)).ToArray();
            var w = weights.Length == 0 ? ReadOnlySpan<double>.Empty : weights.AsSpan(start, len);
            acc.AddBatch(cols, w, fileRowOfFirst + start);
        }
    }

    /// <summary>Asserts |actual − expected| ≤ relative·|expected| + absolute, element by element.</summary>
    internal static void Near(double[] expected, double[] actual, double relative, double absolute)
    {
        Assert.Equal(expected.Length, actual.Length);
        for (var i = 0; i < expected.Length; i++) ScipyFixture.Near(expected[i], actual[i], relative, absolute);
    }
}
