using GateTasks.Engine.Drafting;

namespace GateTasks.Engine.Tests.Drafting;

/// <summary>Misra &amp; Gries (1982): with k counters every value of share above 1/(k+1) must be a candidate.</summary>
public class HeavyHittersTests
{
    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    public void Every_value_above_the_share_bound_is_a_candidate(int seed)
    {
        const int k = 9; // bound 1/10
        var random = new Random(seed);
        var stream = new List<double>();
        // Three frequent values (25%, 15%, 10.5%) in a sea of distinct ones, shuffled.
        stream.AddRange(Enumerable.Repeat(7.0, 2500));
        stream.AddRange(Enumerable.Repeat(-1.5, 1500));
        stream.AddRange(Enumerable.Repeat(0.0, 1050));
        stream.AddRange(Enumerable.Range(0, 4950).Select(i => 100.0 + i));
        var shuffled = stream.OrderBy(_ => random.Next()).ToList();

        var hitters = new HeavyHitters(k);
        foreach (var v in shuffled) hitters.Add(v);

        var exact = shuffled.GroupBy(v => v).Where(g => g.Count() > shuffled.Count / (k + 1)).Select(g => g.Key).ToList();
        Assert.Equal([7.0, -1.5, 0.0], exact.OrderByDescending(v => shuffled.Count(x => x == v)));
        Assert.All(exact, v => Assert.Contains(v, hitters.Candidates));
        Assert.True(hitters.Candidates.Count <= k);
    }
}
