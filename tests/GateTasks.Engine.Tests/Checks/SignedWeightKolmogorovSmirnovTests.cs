using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// KS distance, its effective counts and both KS checks on cells of either sign (a −0.5 event alone in a flow cell):
/// measured, not refused. Expectations by hand from the definitions (normalised cumulative sums; the delta-method
/// variance of A/(A + B)).
/// </summary>
public class SignedWeightKolmogorovSmirnovTests
{
    private static readonly SourceLocation At = new("c.yaml", 3, 5);

    // Cells: underflow, [0,1), [1,2), overflow.
    private static readonly double[] RefW = [0, 50, 50, 0];
    private static readonly double[] SurW = [0, 30, 20, -0.5];
    private static readonly double[] SurW2 = [0, 30, 20, 0.25];

    private static FeatureComparison Comparison()
    {
        var axis = new RegularAxis(2, 0, 2);
        var spec = new FeatureSpec("x", "x", FeatureKind.Continuous, new QuantileBinning(2, At), new CoreSpec(0.05, 0.95, At), [], At, At);
        var summary = new FeatureSummary(1, 1, 1, 0, 1, 0, 1, 0);
        var reference = Histogram.FromCells(axis, RefW, RefW, 100, 0, 0, 0);
        var rf = new ReferenceFeature("x", "x", FeatureKind.Continuous, "quantile:2", reference, summary, []);
        return new FeatureComparison(spec, rf, Histogram.FromCells(axis, SurW, SurW2, 51, 0, 0, 0), summary, [true, true]);
    }

    [Fact]
    public void The_distance_is_taken_on_signed_cells()
    {
        // CDFs at the boundaries: reference 0, 0.5, 1, 1; sample 0, 30/49.5, 50/49.5, 1 → D = 30/49.5 − 0.5, by hand.
        Assert.Equal(0.10606060606060608, KolmogorovSmirnov.BinnedDistance(RefW, SurW), 14);
    }

    [Fact]
    public void The_cdf_effective_count_is_n_for_unit_weights_and_follows_the_cells_sum_of_squares()
    {
        // Unit weights: Var(F) = F(1 − F)/n at every boundary (binomial), so the count is n = 100 exactly.
        Assert.Equal(100, KolmogorovSmirnov.CdfEffectiveCount(RefW, RefW), 10);
        // Signed: only the boundary after [0,1) has 0 < F < 1: A = 30, V_A = 30, B = 19.5, V_B = 20.25, T = 49.5;
        // F(1 − F)/((B²V_A + A²V_B)/T⁴) = 48.372437357631 by hand (evaluated in Python double precision).
        Assert.Equal(48.37243735763097, KolmogorovSmirnov.CdfEffectiveCount(SurW, SurW2), 9);
        // A total weight of zero or less is no distribution: refused, not turned into a number.
        var e = Assert.Throws<GateInputException>(() => KolmogorovSmirnov.CdfEffectiveCount([0, 1, -1, 0], [0, 1, 1, 0]));
        Assert.Equal(ErrorCodes.SampleEmpty, e.Code); // docs/error-codes.md
    }

    [Fact]
    public void Both_ks_checks_measure_a_sample_with_a_negative_flow_cell()
    {
        var c = Comparison();
        var band = CheckEvaluator.Measure(c, new ToleranceCheck(CheckKind.KolmogorovSmirnov, 0.05, At), DecisionSettings.Default);
        Assert.False(double.IsNaN(band.Estimate), band.Summary);
        Assert.Equal(0.10606060606060608, band.Estimate, 14);
        var test = CheckEvaluator.Measure(c, new GoodnessOfFitTest(CheckKind.KolmogorovSmirnovTest, At), DecisionSettings.Default);
        Assert.False(double.IsNaN(test.Estimate), test.Summary);
        Assert.InRange(test.PValue, 0, 1);
    }

    [Fact]
    public void A_check_that_cannot_be_computed_is_undecided_with_its_reason()
    {
        // docs/checks.md: an uncomputable measurement is inconclusive, never a p-value of 0 (the JS divergence refuses
        // negative cells).
        var c = Comparison();
        var spec = new ToleranceCheck(CheckKind.JensenShannon, 0.05, At);
        var m = CheckEvaluator.Measure(c, spec, DecisionSettings.Default);
        Assert.True(m.Uncomputable);
        Assert.StartsWith("cannot be computed", m.Summary);
        var o = VerdictRule.Decide([(new FeatureSubject(c.Spec), spec, m)], DecisionSettings.Default).Single();
        Assert.Equal(Verdict.Inconclusive, o.Verdict);
    }
}
