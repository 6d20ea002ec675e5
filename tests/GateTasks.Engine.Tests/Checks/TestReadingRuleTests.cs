using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// Goodness-of-fit tests form a family of their own, apart from the tolerance checks (docs/contract.md, "Goodness-of-fit
/// tests: diagnostics"). Expected adjusted p-values are Holm's (1979) step-down by hand: the k-th smallest of m
/// p-values is multiplied by m − k + 1, with the running maximum.
/// </summary>
public class TestReadingRuleTests
{
    private static readonly SourceLocation At = new("c.yaml", 1, 1);
    private static readonly CheckSubject Subject = new FeatureSubject(new("x", "x", FeatureKind.Continuous, new QuantileBinning(3, At),
        new CoreSpec(0.05, 0.95, At), [], At, At));

    private static Measurement Effect(double p, double upper) => new(0.01, 0, upper, p, "", []);

    private static Measurement Test(double p) => new(30, double.NaN, double.NaN, p, "", []);

    [Fact]
    public void Tests_are_read_in_their_own_family_and_leave_the_tolerance_checks_alone()
    {
        var tolerance = new ToleranceCheck(CheckKind.KolmogorovSmirnov, 0.02, At);
        var chi2 = new GoodnessOfFitTest(CheckKind.ChiSquareTest, At);
        var ks = new GoodnessOfFitTest(CheckKind.KolmogorovSmirnovTest, At);
        // One tolerance check with p = 0.006 alone in its family: Holm adjusted 0.006 ≤ 0.01, a fail. With the two
        // tests in the same family (before), its adjusted p would have been 3 × 0.006 = 0.018 (by hand): not a fail.
        var outcomes = VerdictRule.Decide([(Subject, tolerance, Effect(0.006, 0.05))], DecisionSettings.Default);
        Assert.Equal(0.006, Assert.Single(outcomes).AdjustedPValue, 12);
        Assert.Equal(Verdict.Fail, outcomes[0].Verdict);

        // The tests: p = 0.004 and 0.03; Holm over the two: 2 × 0.004 = 0.008, max(0.008, 1 × 0.03) = 0.03 (by hand).
        var readings = TestReadingRule.Read([(Subject, chi2, Test(0.004)), (Subject, ks, Test(0.03))], DecisionSettings.Default);
        Assert.Equal(0.008, readings[0].AdjustedPValue, 12);
        Assert.Equal(0.03, readings[1].AdjustedPValue, 12);
        Assert.Equal(Distinguishability.Distinguishable, readings[0].Finding);
        Assert.Equal(Distinguishability.NotDistinguishable, readings[1].Finding);
        Assert.Equal("distinguishable at this size (adjusted p 0.008)", readings[0].Text);
        Assert.Equal("not distinguishable at this size (adjusted p 0.03)", readings[1].Text);
    }

    [Fact]
    public void A_test_handed_to_the_verdict_rule_is_outside_the_family_and_cannot_fail()
    {
        // The simulated replicas of plan and calibrate hand every measurement to the verdict rule: a test there is
        // left out of the correction and cannot fail. With a test of p = 0.5 in the family, Holm would give the
        // tolerance check 2 × 0.006 = 0.012 (by hand), above 0.01; alone it keeps 0.006 and fails.
        var tolerance = new ToleranceCheck(CheckKind.KolmogorovSmirnov, 0.02, At);
        var chi2 = new GoodnessOfFitTest(CheckKind.ChiSquareTest, At);
        var outcomes = VerdictRule.Decide([(Subject, tolerance, Effect(0.006, 0.05)), (Subject, chi2, Test(0.5))], DecisionSettings.Default);
        Assert.Equal(0.006, outcomes[0].AdjustedPValue, 12);
        Assert.Equal(Verdict.Fail, outcomes[0].Verdict);
        // A test however significant does not fail.
        outcomes = VerdictRule.Decide([(Subject, tolerance, Effect(0.5, 0.01)), (Subject, chi2, Test(1e-12))], DecisionSettings.Default);
        Assert.Equal(Verdict.Pass, outcomes[0].Verdict);
        Assert.NotEqual(Verdict.Fail, outcomes[1].Verdict);
    }

    [Fact]
    public void An_uncomputable_test_is_not_measured_never_distinguishable()
    {
        var chi2 = new GoodnessOfFitTest(CheckKind.ChiSquareTest, At);
        var reading = Assert.Single(TestReadingRule.Read([(Subject, chi2, Measurement.Impossible("no cells", []))], DecisionSettings.Default));
        Assert.Equal(Distinguishability.NotMeasured, reading.Finding);
        Assert.StartsWith("not measured: cannot be computed: no cells", reading.Text);
    }
}
