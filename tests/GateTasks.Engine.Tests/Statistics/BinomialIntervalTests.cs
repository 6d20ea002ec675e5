using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class BinomialIntervalTests
{
    [Theory]
    // Newcombe 1998, Stat. Med. 17:857, Table I, Wilson score interval without continuity correction, 95%
    // [published], given to 4 decimals.
    [InlineData(81, 263, 0.2553, 0.3662)]
    [InlineData(15, 148, 0.0624, 0.1605)]
    [InlineData(0, 20, 0.0, 0.1611)]
    [InlineData(1, 29, 0.0061, 0.1718)]
    public void WilsonMatchesNewcombe(long k, long n, double lower, double upper)
    {
        (double lo, double hi) = BinomialInterval.Wilson(k, n, 0.95);
        Near(lower, lo, 0, 5e-5);
        Near(upper, hi, 0, 5e-5);
    }

    [Theory]
    // scipy 1.10.1 stats.binomtest(k, n).proportion_ci(0.95, method='exact') [scipy], 7 decimals.
    [InlineData(81, 263, 0.2527367, 0.3676219)]
    [InlineData(15, 148, 0.0578440, 0.1616505)]
    [InlineData(0, 20, 0.0, 0.1684335)]
    [InlineData(1, 29, 0.0008726, 0.1776443)]
    public void ClopperPearsonMatchesScipy(long k, long n, double lower, double upper)
    {
        (double lo, double hi) = BinomialInterval.ClopperPearson(k, n, 0.95);
        Near(lower, lo, 0, 5e-8);
        Near(upper, hi, 0, 5e-8);
    }

    [Fact]
    public void ClopperPearsonAtTheEnds()
    {
        // 0/10 upper 0.3084971 and 10/10 lower 0.6915029 [published; R binom.test]; the other ends are exactly 0 and 1.
        Assert.Equal((0.0, 0.3084971), Round7(BinomialInterval.ClopperPearson(0, 10, 0.95)));
        Assert.Equal((0.6915029, 1.0), Round7(BinomialInterval.ClopperPearson(10, 10, 0.95)));
    }

    [Theory]
    [InlineData(10)]
    [InlineData(20)]
    [InlineData(1000)]
    public void ClopperPearsonWithNoSuccessesHasClosedForm(long n)
    {
        // Clopper & Pearson 1934 at k = 0: (1 − u)^n = α/2 ⇒ u = 1 − (α/2)^(1/n) [exact, from the definition].
        (_, double upper) = BinomialInterval.ClopperPearson(0, n, 0.95);
        Near(1 - Math.Pow(0.025, 1.0 / n), upper, 1e-9);
    }

    [Fact]
    public void IntervalsAreSymmetricUnderSwappingOutcomes()
    {
        // Both intervals are equivariant under k → n − k, p → 1 − p (Clopper & Pearson 1934; Wilson 1927) [exact, by definition].
        (double cpLo, double cpHi) = BinomialInterval.ClopperPearson(81, 263, 0.95);
        (double cpLoSwap, double cpHiSwap) = BinomialInterval.ClopperPearson(263 - 81, 263, 0.95);
        Near(1 - cpHi, cpLoSwap, 0, 1e-10);
        Near(1 - cpLo, cpHiSwap, 0, 1e-10);
        (double wLo, double wHi) = BinomialInterval.Wilson(15, 148, 0.95);
        (double wLoSwap, double wHiSwap) = BinomialInterval.Wilson(148 - 15, 148, 0.95);
        Near(1 - wHi, wLoSwap, 0, 1e-14);
        Near(1 - wLo, wHiSwap, 0, 1e-14);
    }

    [Fact]
    public void WilsonEffectiveWithEqualWeightsIsWilson()
    {
        // Equal weights give the Kish (1965) effective count n ([1,1,1,1] → 4), so the
        // weighted interval must reproduce Newcombe 1998's 81/263 → 0.2553–0.3662 [published].
        double[] weights = Enumerable.Repeat(0.7, 263).ToArray();
        double nEff = Math.Pow(weights.Sum(), 2) / weights.Sum(w => w * w);
        double fraction = weights.Take(81).Sum() / weights.Sum();
        (double lo, double hi) = BinomialInterval.WilsonEffective(fraction, nEff, 0.95);
        Near(0.2553, lo, 0, 5e-5);
        Near(0.3662, hi, 0, 5e-5);
        (double exactLo, double exactHi) = BinomialInterval.Wilson(81, 263, 0.95);
        Near(exactLo, lo, 1e-12);
        Near(exactHi, hi, 1e-12);
    }

    [Fact]
    public void WilsonEffectiveWidensWhenWeightsVary()
    {
        // Kish (1965): weights [1,1,1,1,10] → n_eff = 196/104 < 5 [published]; a smaller
        // effective count must give a wider Wilson interval than the raw count would.
        double nEff = 196.0 / 104.0;
        (double lo, double hi) = BinomialInterval.WilsonEffective(0.4, nEff, 0.95);
        (double rawLo, double rawHi) = BinomialInterval.WilsonEffective(0.4, 5, 0.95);
        Assert.True(lo < rawLo && hi > rawHi);
        Assert.Equal(0.0, BinomialInterval.WilsonEffective(0, nEff, 0.95).Lower);
        Assert.Equal(1.0, BinomialInterval.WilsonEffective(1, nEff, 0.95).Upper);
    }

    [Fact]
    public void BadArgumentsAreRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.ClopperPearson(3, 2, 0.95));
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.ClopperPearson(0, 0, 0.95));
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.Wilson(-1, 10, 0.95));
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.Wilson(1, 10, 1.0));
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.WilsonEffective(1.2, 10, 0.95));
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.WilsonEffective(0.5, 0, 0.95));
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.WilsonEffective(0.5, 10, double.NaN));
    }

    private static (double, double) Round7((double Lower, double Upper) interval) =>
        (Math.Round(interval.Lower, 7), Math.Round(interval.Upper, 7));
}
