using System.Text.Json;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

/// <summary>
/// Exact summation against CPython's math.fsum (Shewchuk's algorithm, correctly rounded): tests/fixtures/python/fsum.json,
/// written by tests/fixtures/python/make_fsum_fixtures.py with Debian's /usr/bin/python3 3.11.
/// </summary>
public class ExactSumTests
{
    private static readonly Lazy<JsonDocument> Fixture = new(() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "python", "fsum.json"))));

    public static TheoryData<string> Cases() => new(Fixture.Value.RootElement.GetProperty("cases").EnumerateArray().Select(c => c.GetProperty("name").GetString()!));

    private static (double[] Terms, double Fsum) Case(string name)
    {
        var c = Fixture.Value.RootElement.GetProperty("cases").EnumerateArray().First(e => e.GetProperty("name").GetString() == name);
        return (c.GetProperty("terms").EnumerateArray().Select(v => v.GetDouble()).ToArray(), c.GetProperty("fsum").GetDouble());
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void The_sum_is_math_fsum_in_any_order_and_any_grouping(string name)
    {
        var (terms, fsum) = Case(name);
        var s = new ExactSum();
        foreach (var t in terms) s.Add(t);
        Assert.Equal(fsum, s.Value);

        // Reversed, and in four shards merged in another order: bit for bit the same.
        var reversed = new ExactSum();
        foreach (var t in terms.Reverse()) reversed.Add(t);
        Assert.Equal(fsum, reversed.Value);
        var shards = Enumerable.Range(0, 4).Select(k => { var e = new ExactSum(); foreach (var t in terms.Where((_, i) => i % 4 == k)) e.Add(t); return e; }).ToArray();
        var merged = new ExactSum();
        foreach (var k in new[] { 2, 0, 3, 1 }) merged.Add(shards[k]);
        Assert.Equal(fsum, merged.Value);
        // Read back from its partials as a shard file stores them.
        var restored = new ExactSum();
        foreach (var partial in merged.Terms) restored.Add(partial);
        Assert.Equal(fsum, restored.Value);
    }

    [Fact]
    public void Non_finite_terms_are_refused()
    {
        Assert.Equal(GateTasks.Engine.Diagnostics.ErrorCodes.SampleBadWeight, Assert.Throws<GateTasks.Engine.Diagnostics.GateInputException>(() => new ExactSum().Add(double.NaN)).Code);
        Assert.Equal(GateTasks.Engine.Diagnostics.ErrorCodes.SampleBadWeight, Assert.Throws<GateTasks.Engine.Diagnostics.GateInputException>(() => new ExactSum().Add(double.PositiveInfinity)).Code);
    }
}
