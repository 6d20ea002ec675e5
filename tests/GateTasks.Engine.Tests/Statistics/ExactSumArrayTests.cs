using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

/// <summary>The compact exact sums: values by hand, and the program against itself (<see cref="ExactSum"/>, and any order).</summary>
public sealed class ExactSumArrayTests
{
    [Fact]
    public void A_sum_that_needs_three_terms_stays_exact()
    {
        // By hand: 1e30 + 1 + 1e-30 − 1e30 − 1 = 1e-30 exactly; a double-double holding the first three would lose it.
        var s = new ExactSumArray(2);
        foreach (var x in new[] { 1e30, 1.0, 1e-30, -1e30, -1.0 }) s.Add(1, x);
        Assert.Equal(1e-30, s.Value(1));
        Assert.Equal(0.0, s.Value(0));
    }

    [Fact]
    public void Values_equal_exact_sums_in_any_order_and_through_the_state()
    {
        var rng = new Random(7);
        var terms = Enumerable.Range(0, 400).Select(_ => (rng.NextDouble() - 0.5) * Math.Pow(10, rng.Next(-12, 12))).ToArray();
        var forward = new ExactSumArray(3);
        var backward = new ExactSumArray(3);
        var reference = new ExactSum[3].Select(_ => new ExactSum()).ToArray();
        for (var i = 0; i < terms.Length; i++)
        {
            forward.Add(i % 3, terms[i]);
            backward.Add((terms.Length - 1 - i) % 3, terms[terms.Length - 1 - i]);
            reference[i % 3].Add(terms[i]);
        }
        var restored = new ExactSumArray(3);
        Assert.True(restored.AddState(forward.State()));
        for (var c = 0; c < 3; c++)
        {
            Assert.Equal(reference[c].Value, forward.Value(c));
            Assert.Equal(forward.Value(c), backward.Value(c));
            Assert.Equal(forward.Value(c), restored.Value(c));
        }
        Assert.False(restored.AddState(new ExactSumArray(2).State()));
    }

    [Fact]
    public void Ordinary_batch_sums_stay_in_two_terms()
    {
        // The program against itself: ten thousand batch sums of weights (arbitrary doubles near 1e3) never need a
        // third term, so the compact form keeps its 16 bytes per sum; the value is still the exact sum.
        var rng = new Random(11);
        var s = new ExactSumArray(4);
        var exact = new ExactSum();
        for (var i = 0; i < 10_000; i++)
        {
            var x = (0.5 + rng.NextDouble()) * 1e3;
            s.Add(i % 4, x);
            if (i % 4 == 0) exact.Add(x);
        }
        Assert.Empty(s.State().Spilled);
        Assert.Equal(exact.Value, s.Value(0));
    }
}
