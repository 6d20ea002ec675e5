using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class ChiSquareHomogeneityTests
{
    private static readonly double[] H1 = { 0, 1, 0, 1, 1, 6, 7, 2, 22, 30, 27, 20, 13, 9, 9, 13, 19, 11, 9, 0 };
    private static readonly double[] H2Weights =
    {
        2.20173025, 3.30143857, 2.5892849, 2.99990201, 4.92877054, 8.33036995, 6.95084763, 15.206357, 23.9236012,
        44.3848114, 49.4465599, 25.1868858, 16.3129692, 13.0289612, 16.7857609, 22.9914703, 30.5279255, 12.5252123,
        16.4104557, 7.86067867,
    };
    private static readonly double[] H2Errors =
    {
        0.38974303, 0.536510944, 0.529702604, 0.642001867, 0.969341516, 1.47611344, 1.69797957, 3.28577447,
        5.40784931, 9.10106468, 9.73541737, 5.55019951, 3.57914758, 2.77877331, 3.23697519, 4.3608489, 5.77172089,
        3.38666105, 2.98861837, 1.58402085,
    };

    private static double[] Squares(double[] s) => s.Select(v => v * v).ToArray();

    [Fact]
    public void UnweightedWeightedPublishedExample()
    {
        ChiSquareResult r = ChiSquareHomogeneity.UnweightedWeighted(H1, H2Weights, Squares(H2Errors));
        // Gagunashvili 2006 unweighted–weighted example [published]: X² = 21.085124, ndf 19, p 0.332116
        Near(21.085124, r.ChiSquare, 0, 5e-7);
        Assert.Equal(19, r.DegreesOfFreedom);
        Near(0.332116, r.PValue, 0, 5e-7);
    }

    [Fact]
    public void UnweightedWeightedModifiedExample()
    {
        double[] h1 = (double[])H1.Clone();
        h1[14] += 17; // bin 15 (1-based)
        ChiSquareResult r = ChiSquareHomogeneity.UnweightedWeighted(h1, H2Weights, Squares(H2Errors));
        // Gagunashvili 2006, same example with 17 added to bin 15 of h1 [published]: 32.333882, p 0.028653
        Near(32.333882, r.ChiSquare, 0, 5e-7);
        Near(0.028653, r.PValue, 0, 5e-7);
    }

    [Theory]
    // scipy 1.10.1 chi2_contingency([a, b], correction=False) [scipy]
    [InlineData(new double[] { 10, 25, 40, 18, 7 }, new double[] { 14, 30, 31, 20, 5 }, 2.7006536829, 4, 0.6091002312)]
    [InlineData(new double[] { 5, 12, 30, 22, 9, 2 }, new double[] { 20, 41, 70, 52, 25, 12 }, 3.0285795998, 5, 0.6955795233)]
    public void UnweightedMatchesContingencyTable(double[] a, double[] b, double chi2, int ndf, double p)
    {
        ChiSquareResult r = ChiSquareHomogeneity.Unweighted(a, b);
        Near(chi2, r.ChiSquare, 0, 5e-11);
        Assert.Equal(ndf, r.DegreesOfFreedom);
        Near(p, r.PValue, 0, 5e-11);
    }

    [Fact]
    public void BinsEmptyInBothAreSkipped()
    {
        // Same scipy chi2_contingency case as above [scipy] with empty bins inserted.
        ChiSquareResult r = ChiSquareHomogeneity.Unweighted(new double[] { 0, 10, 25, 0, 40, 18, 7, 0 }, new double[] { 0, 14, 30, 0, 31, 20, 5, 0 });
        Near(2.7006536829, r.ChiSquare, 0, 5e-11);
        Assert.Equal(4, r.DegreesOfFreedom);
        Near(0.6091002312, r.PValue, 0, 5e-11);
    }

    [Theory]
    [InlineData("random_12")]
    [InlineData("random_15_two_empty")]
    public void WeightedMatchesNumpyFormula(string name)
    {
        // numpy 1.24.2 evaluation of Gagunashvili 2010's weighted–weighted X², p = scipy 1.10.1 stats.chi2.sf, fixture chi2_weighted_weighted/<name>
        var c = Case("chi2_weighted_weighted", name);
        ChiSquareResult r = ChiSquareHomogeneity.Weighted(c.Doubles("w1"), c.Doubles("s1sq"), c.Doubles("w2"), c.Doubles("s2sq"));
        Near(c.Double("chi2"), r.ChiSquare, 1e-12);
        Assert.Equal(c.GetProperty("ndf").GetInt32(), r.DegreesOfFreedom);
        Near(c.Double("pvalue"), r.PValue, 1e-10);
    }

    [Fact]
    public void WeightedWithUnitWeightsEqualsUnweighted()
    {
        // With unit weights s² = w = n, the weighted formula reduces to the unweighted one (Gagunashvili 2010);
        // checked on the scipy chi2_contingency case [scipy].
        double[] a = { 10, 25, 40, 18, 7 }, b = { 14, 30, 31, 20, 5 };
        ChiSquareResult r = ChiSquareHomogeneity.Weighted(a, a, b, b);
        Near(2.7006536829, r.ChiSquare, 0, 5e-11);
    }

    [Fact]
    public void MismatchedBinningIsRejected()
    {
        var e = Assert.Throws<GateInputException>(() => ChiSquareHomogeneity.Unweighted(new double[] { 1, 2 }, new double[] { 1, 2, 3 }));
        Assert.Equal(ErrorCodes.ReferenceMismatch, e.Code);
    }
}
