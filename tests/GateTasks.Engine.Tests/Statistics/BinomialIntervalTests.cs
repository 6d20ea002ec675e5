using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class BinomialIntervalTests
{
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
        // The interval is equivariant under k → n − k, p → 1 − p (Clopper & Pearson 1934) [exact, by definition].
        (double cpLo, double cpHi) = BinomialInterval.ClopperPearson(81, 263, 0.95);
        (double cpLoSwap, double cpHiSwap) = BinomialInterval.ClopperPearson(263 - 81, 263, 0.95);
        Near(1 - cpHi, cpLoSwap, 0, 1e-10);
        Near(1 - cpLo, cpHiSwap, 0, 1e-10);
    }

    [Fact]
    public void BadArgumentsAreRejected()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.ClopperPearson(3, 2, 0.95));
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.ClopperPearson(0, 0, 0.95));
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.ClopperPearson(-1, 10, 0.95));
        Assert.Throws<ArgumentOutOfRangeException>(() => BinomialInterval.ClopperPearson(1, 10, 1.0));
    }

    private static (double, double) Round7((double Lower, double Upper) interval) =>
        (Math.Round(interval.Lower, 7), Math.Round(interval.Upper, 7));
}
