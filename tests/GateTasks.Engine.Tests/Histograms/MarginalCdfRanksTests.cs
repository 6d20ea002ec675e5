using System.Text.Json;
using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Tests.Histograms;

/// <summary>
/// The batched Spearman ranks (<see cref="MarginalCdf.Ranks"/>: four values at a time from a per-cell table) against
/// numpy: numpy.interp over the histogram's CDF at its edges inside the axis, numpy.searchsorted for the cells, frozen
/// with Debian's numpy 1.24.2 / Python 3.11.2 into tests/fixtures/numpy/marginal_ranks.json by
/// tests/fixtures/numpy/make_marginal_rank_fixtures.py (the file records the calls and versions). The flows' ranks,
/// the mid-rank of their point mass, are common practice for ties, not numpy's.
/// </summary>
public class MarginalCdfRanksTests
{
    private static readonly JsonElement Cases =
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "numpy", "marginal_ranks.json"))).RootElement.GetProperty("cases");

    private static double[] Doubles(JsonElement a) => a.EnumerateArray().Select(v => v.GetDouble()).ToArray();

    // The fixture's histogram: each bin's count at its centre, the flows' beyond the axis.
    private static Histogram Reference(double[] edges, double[] counts)
    {
        var h = new Histogram(new VariableAxis(edges));
        h.Fill(edges[0] - 1, counts[0]);
        for (var b = 0; b < edges.Length - 1; b++)
            if (counts[b + 1] > 0) h.Fill(0.5 * (edges[b] + edges[b + 1]), counts[b + 1]);
        h.Fill(edges[^1] + 1, counts[^1]);
        return h;
    }

    public static TheoryData<string> Names => new() { "irregular_31", "regular_50" };

    [Theory]
    [MemberData(nameof(Names))]
    public void Ranks_agree_with_numpy_interp(string name)
    {
        var c = Cases.EnumerateArray().Single(e => e.GetProperty("name").GetString() == name);
        var (edges, counts, probes) = (Doubles(c.GetProperty("edges")), Doubles(c.GetProperty("counts")), Doubles(c.GetProperty("probes")));
        var expectedCells = c.GetProperty("cells").EnumerateArray().Select(v => v.GetInt32()).ToArray();
        var expected = Doubles(c.GetProperty("ranks"));
        var h = Reference(edges, counts);
        var cdf = new MarginalCdf(h);
        var cells = new int[probes.Length];
        h.Axis.Cells(probes, cells, -1);
        // numpy.searchsorted(edges, probe, side="right") is the storage cell.
        Assert.Equal(expectedCells, cells);
        var ranks = new double[probes.Length];
        Assert.False(cdf.Ranks(probes, cells, ranks, -1));
        // Tolerance chosen by us: numpy.interp computes slope·(x − e) + F, the program F + ((x − e)/w)·ΔF, so the two
        // differ by a few roundings of numbers at most 1 (seen: up to 1.1e-16).
        for (var k = 0; k < probes.Length; k++)
            Assert.True(Math.Abs(ranks[k] - expected[k]) <= 1e-15, $"probe {probes[k]:R} (cell {cells[k]}): {ranks[k]:R} vs numpy {expected[k]:R}");
    }

    /// <summary>
    /// A comparison of the program with itself: the batched ranks are <see cref="MarginalCdf.Evaluate"/>'s to the bit,
    /// infinities and NaN included, from every offset and for every length, so the registers' lanes and the rows
    /// after the last whole register agree.
    /// </summary>
    [Theory]
    [MemberData(nameof(Names))]
    public void Batched_ranks_are_the_searched_ranks_to_the_bit(string name)
    {
        var c = Cases.EnumerateArray().Single(e => e.GetProperty("name").GetString() == name);
        var h = Reference(Doubles(c.GetProperty("edges")), Doubles(c.GetProperty("counts")));
        var cdf = new MarginalCdf(h);
        var probes = Doubles(c.GetProperty("probes"))
            .Concat([double.PositiveInfinity, double.NegativeInfinity, double.MaxValue, -double.MaxValue, 0.0, -0.0]).ToArray();
        var withNaN = probes.Select((p, k) => k % 97 == 5 ? double.NaN : p).ToArray();
        foreach (var values in new[] { probes, withNaN })
        {
            var cells = new int[values.Length];
            h.Axis.Cells(values, cells, -1);
            for (var from = 0; from < 4; from++)
                foreach (var length in new[] { 0, 1, 3, 4, 5, 9, values.Length - from })
                {
                    ReadOnlySpan<double> v = values.AsSpan(from, length);
                    ReadOnlySpan<int> k = cells.AsSpan(from, length);
                    var ranks = new double[length];
                    var nan = cdf.Ranks(v, k, ranks, -1);
                    Assert.Equal(v.ToArray().Any(double.IsNaN), nan);
                    for (var r = 0; r < length; r++)
                        Assert.True(BitConverter.DoubleToInt64Bits(cdf.Evaluate(v[r])) == BitConverter.DoubleToInt64Bits(ranks[r]),
                            $"{v[r]:R} (cell {k[r]}): {ranks[r]:R} vs {cdf.Evaluate(v[r]):R}");
                }
        }
    }
}
