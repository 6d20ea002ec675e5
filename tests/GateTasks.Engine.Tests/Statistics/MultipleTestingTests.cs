using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class MultipleTestingTests
{
    // Benjamini & Hochberg (1995), JRSS-B 57:289, Section 4.2: the 15 p-values of their worked example [published].
    private static readonly double[] BenjaminiHochbergExample =
    {
        0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.000,
    };

    [Fact]
    public void BenjaminiHochbergRejectsFourOfTheExample()
    {
        bool[] rejected = MultipleTesting.Reject(BenjaminiHochbergExample, 0.05, MultipleTestingMethod.BenjaminiHochberg);
        // Benjamini & Hochberg 1995: at q = 0.05 the step-up procedure rejects the four smallest [published].
        Assert.Equal(Enumerable.Range(0, 15).Select(i => i < 4), rejected);
    }

    [Fact]
    public void BonferroniRejectsThreeOfTheExample()
    {
        bool[] rejected = MultipleTesting.Reject(BenjaminiHochbergExample, 0.05, MultipleTestingMethod.Bonferroni);
        // Benjamini & Hochberg 1995: Bonferroni at 0.05 rejects three [published].
        Assert.Equal(Enumerable.Range(0, 15).Select(i => i < 3), rejected);
    }

    [Fact]
    public void HolmRejectsThreeOfTheExample()
    {
        bool[] rejected = MultipleTesting.Reject(BenjaminiHochbergExample, 0.05, MultipleTestingMethod.Holm);
        // Holm (1979) rejects three of the Benjamini–Hochberg p-values (computed); by hand,
        // 13·0.0019 = 0.0247 ≤ 0.05 but 12·0.0095 = 0.114 > 0.05, so the step-down stops after the third.
        Assert.Equal(Enumerable.Range(0, 15).Select(i => i < 3), rejected);
    }

    [Fact]
    public void BenjaminiHochbergAdjustedValues()
    {
        double[] adjusted = MultipleTesting.Adjust(BenjaminiHochbergExample, MultipleTestingMethod.BenjaminiHochberg);
        // BH-adjusted values of the Benjamini & Hochberg (1995) example [computed] (given to 8 significant digits).
        double[] expected =
        {
            0.0015, 0.003, 0.0095, 0.035625, 0.0603, 0.06385714, 0.06385714, 0.0645, 0.0765, 0.486, 0.58118182,
            0.714875, 0.75323077, 0.81321429, 1.0,
        };
        for (int i = 0; i < expected.Length; i++)
            Near(expected[i], adjusted[i], 0, 5e-9);
    }

    [Fact]
    public void HolmAdjustedValues()
    {
        double[] adjusted = MultipleTesting.Adjust(BenjaminiHochbergExample, MultipleTestingMethod.Holm);
        // [computed] Rechecked [exact, hand-computed] from Holm's (1979)
        // definition p̃_(j) = max_{i≤j} min(1, (m − i + 1) p_(i)), m = 15:
        //   15·0.0001 = 0.0015; 14·0.0004 = 0.0056; 13·0.0019 = 0.0247; 12·0.0095 = 0.114; 11·0.0201 = 0.2211;
        //   10·0.0278 = 0.278; 9·0.0298 = 0.2682 → running max 0.278; 8·0.0344 = 0.2752 → 0.278;
        //   7·0.0459 = 0.3213; 6·0.3240 = 1.944 → capped 1; the rest are ≥ 1 → 1.
        // (The same numbers come out of a six-line loop over that definition in /usr/bin/python3, no library.)
        double[] expected = { 0.0015, 0.0056, 0.0247, 0.114, 0.2211, 0.278, 0.278, 0.278, 0.3213, 1, 1, 1, 1, 1, 1 };
        for (int i = 0; i < expected.Length; i++)
            Near(expected[i], adjusted[i], 1e-12, 1e-15);
    }

    [Fact]
    public void BonferroniAdjustedValuesAreCappedProducts()
    {
        double[] adjusted = MultipleTesting.Adjust(BenjaminiHochbergExample, MultipleTestingMethod.Bonferroni);
        // Bonferroni by definition min(1, m·p) [exact, hand-computed]: 15·0.0001 = 0.0015, 15·0.0459 = 0.6885, 15·0.3240 = 4.86 → 1 and so on.
        Near(0.0015, adjusted[0], 1e-12);
        Near(0.6885, adjusted[8], 1e-12);
        Assert.All(adjusted.Skip(9), a => Assert.Equal(1.0, a));
    }

    [Theory]
    [InlineData(nameof(MultipleTestingMethod.Holm))]
    [InlineData(nameof(MultipleTestingMethod.BenjaminiHochberg))]
    [InlineData(nameof(MultipleTestingMethod.Bonferroni))]
    public void PermutingTheInputPermutesTheOutput(string methodName)
    {
        var method = Enum.Parse<MultipleTestingMethod>(methodName);
        // The corrections depend only on ranks (Holm 1979; Benjamini & Hochberg 1995), so they commute with permutations.
        int[] permutation = { 7, 14, 0, 3, 11, 5, 9, 1, 13, 2, 8, 6, 12, 4, 10 };
        double[] permuted = permutation.Select(i => BenjaminiHochbergExample[i]).ToArray();
        double[] adjusted = MultipleTesting.Adjust(BenjaminiHochbergExample, method);
        double[] adjustedPermuted = MultipleTesting.Adjust(permuted, method);
        double[] levels = MultipleTesting.PerTestLevels(BenjaminiHochbergExample, 0.05, method);
        double[] levelsPermuted = MultipleTesting.PerTestLevels(permuted, 0.05, method);
        for (int j = 0; j < permutation.Length; j++)
        {
            Assert.Equal(adjusted[permutation[j]], adjustedPermuted[j]);
            Assert.Equal(levels[permutation[j]], levelsPermuted[j]);
        }
    }

    [Theory]
    [InlineData(nameof(MultipleTestingMethod.Holm))]
    [InlineData(nameof(MultipleTestingMethod.BenjaminiHochberg))]
    [InlineData(nameof(MultipleTestingMethod.Bonferroni))]
    public void ASingleTestIsUncorrected(string methodName)
    {
        var method = Enum.Parse<MultipleTestingMethod>(methodName);
        // With m = 1 every procedure reduces to the test itself (m·p = p, rank 1 of 1) [exact, by definition].
        Assert.Equal(new[] { 0.037 }, MultipleTesting.Adjust(new[] { 0.037 }, method));
        Assert.Equal(new[] { 0.05 }, MultipleTesting.PerTestLevels(new[] { 0.037 }, 0.05, method));
        Assert.Equal(new[] { true }, MultipleTesting.Reject(new[] { 0.037 }, 0.05, method));
    }

    [Theory]
    [InlineData(nameof(MultipleTestingMethod.Holm))]
    [InlineData(nameof(MultipleTestingMethod.BenjaminiHochberg))]
    [InlineData(nameof(MultipleTestingMethod.Bonferroni))]
    public void AllOnesStayOne(string methodName)
    {
        var method = Enum.Parse<MultipleTestingMethod>(methodName);
        // Adjusted p-values are capped at 1 [exact, by definition]; nothing is rejected.
        double[] ones = { 1, 1, 1, 1 };
        Assert.Equal(ones, MultipleTesting.Adjust(ones, method));
        Assert.All(MultipleTesting.Reject(ones, 0.05, method), Assert.False);
    }

    [Fact]
    public void TiedPValuesGetEqualAdjustedValues()
    {
        double[] p = { 0.04, 0.01, 0.01, 0.03 };
        // [exact, hand-computed] m = 4, sorted 0.01, 0.01, 0.03, 0.04.
        // Holm: 4·0.01 = 0.04, 3·0.01 = 0.03 → max 0.04, 2·0.03 = 0.06, 1·0.04 = 0.04 → max 0.06.
        AssertSequence(new[] { 0.06, 0.04, 0.04, 0.06 }, MultipleTesting.Adjust(p, MultipleTestingMethod.Holm));
        // BH: from the top 4·0.04/4 = 0.04, 4·0.03/3 = 0.04, 4·0.01/2 = 0.02, 4·0.01/1 = 0.04 → min 0.02.
        AssertSequence(new[] { 0.04, 0.02, 0.02, 0.04 }, MultipleTesting.Adjust(p, MultipleTestingMethod.BenjaminiHochberg));
    }

    [Fact]
    public void PerTestLevelsFollowTheRanks()
    {
        double[] p = { 0.04, 0.01, 0.01, 0.03 };
        // [exact, hand-computed] level 0.05, m = 4; the tie at 0.01 holds ranks 1–2.
        // Holm α/(m − rank + 1), tie at its first rank: 0.01 → 0.05/4; 0.03 (rank 3) → 0.05/2; 0.04 (rank 4) → 0.05.
        AssertSequence(new[] { 0.05, 0.0125, 0.0125, 0.025 }, MultipleTesting.PerTestLevels(p, 0.05, MultipleTestingMethod.Holm));
        // BH rank·α/m, tie at its last rank: 0.01 → 2·0.05/4; 0.03 → 3·0.05/4; 0.04 → 0.05.
        AssertSequence(new[] { 0.05, 0.025, 0.025, 0.0375 },
            MultipleTesting.PerTestLevels(p, 0.05, MultipleTestingMethod.BenjaminiHochberg));
        // Bonferroni α/m.
        AssertSequence(new[] { 0.0125, 0.0125, 0.0125, 0.0125 }, MultipleTesting.PerTestLevels(p, 0.05, MultipleTestingMethod.Bonferroni));
    }

    [Fact]
    public void PerTestLevelsOfTheExampleMatchTheDecisions()
    {
        // Benjamini & Hochberg 1995 compare p_(i) with i·q/m; the largest i with p_(i) ≤ i·0.05/15 is 4
        // (0.0095 ≤ 0.01333, 0.0201 > 0.01667, …) [published: BH rejects 4].
        double[] levels = MultipleTesting.PerTestLevels(BenjaminiHochbergExample, 0.05, MultipleTestingMethod.BenjaminiHochberg);
        Near(4 * 0.05 / 15, levels[3], 1e-15);
        int lastBelow = Enumerable.Range(0, 15).Last(i => BenjaminiHochbergExample[i] <= levels[i]);
        Assert.Equal(3, lastBelow);
    }

    [Fact]
    public void EmptyFamilyGivesEmptyResults()
    {
        // No tests, nothing to adjust [exact].
        Assert.Empty(MultipleTesting.Adjust(ReadOnlySpan<double>.Empty, MultipleTestingMethod.Holm));
        Assert.Empty(MultipleTesting.Reject(ReadOnlySpan<double>.Empty, 0.05, MultipleTestingMethod.BenjaminiHochberg));
    }

    [Theory]
    [InlineData(double.NaN)]
    [InlineData(-0.1)]
    [InlineData(1.5)]
    public void InvalidPValuesAreRejected(double bad)
    {
        var ex = Assert.Throws<ArgumentException>(() => MultipleTesting.Adjust(new[] { 0.01, bad }, MultipleTestingMethod.Holm));
        Assert.Contains("p-value 1", ex.Message);
    }

    [Fact]
    public void InvalidLevelIsRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => MultipleTesting.Reject(new[] { 0.01 }, 0, MultipleTestingMethod.Holm));
        Assert.Throws<ArgumentOutOfRangeException>(() => MultipleTesting.PerTestLevels(new[] { 0.01 }, double.NaN, MultipleTestingMethod.Holm));
    }

    private static void AssertSequence(double[] expected, double[] actual)
    {
        Assert.Equal(expected.Length, actual.Length);
        for (int i = 0; i < expected.Length; i++)
            Near(expected[i], actual[i], 1e-12, 1e-15);
    }
}
