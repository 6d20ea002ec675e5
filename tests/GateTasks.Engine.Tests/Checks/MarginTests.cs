using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Tests.Checks;

public class MarginTests
{
    private static readonly SourceLocation At = new("c.yaml", 1, 1);
    private static readonly CheckSubject Subject = new FeatureSubject(new("x", "x", FeatureKind.Continuous, new QuantileBinning(3, At),
        new CoreSpec(0.05, 0.95, At), [], At, At));

    [Fact]
    public void An_effect_check_margin_is_one_minus_the_upper_bound_over_the_tolerance()
    {
        // Estimate 0.01, σ 0.002, 95% one-sided bound 0.01 + 1.6448536·0.002 = 0.0132897 (z from the normal table);
        // tolerance 0.02: margin 1 − 0.0132897/0.02 = 0.3355146, noise 0.002/0.02 = 0.1 (by hand).
        var upper = 0.01 + 1.6448536269514722 * 0.002;
        var o = new CheckOutcome(Subject, new ToleranceCheck(CheckKind.KolmogorovSmirnov, 0.02, At),
            new Measurement(0.01, 0.01 - 1.6448536269514722 * 0.002, upper, 1, "", []), Verdict.Pass, 1, 0.01);
        var m = Margin.Of(o, DecisionSettings.Default);
        Assert.Equal(0.3355146, m.Value, 6);
        Assert.Equal(0.1, m.Noise, 9);
    }

    [Fact]
    public void A_test_margin_is_zero_at_its_level_and_an_impossible_measurement_is_minus_infinity()
    {
        var test = new GoodnessOfFitTest(CheckKind.ChiSquareTest, At);
        var atLevel = new CheckOutcome(Subject, test, new Measurement(30, double.NaN, double.NaN, 0.0001, "", []), Verdict.Fail, 0.01, 0.01);
        Assert.Equal(0, Margin.Of(atLevel, DecisionSettings.Default).Value, 12);
        var far = atLevel with { AdjustedPValue = 1 };
        Assert.Equal(0.99, Margin.Of(far, DecisionSettings.Default).Value, 12);
        var impossible = new CheckOutcome(Subject, new ToleranceCheck(CheckKind.KolmogorovSmirnov, 0.02, At),
            Measurement.Impossible("why", []), Verdict.Fail, 0, 0.01);
        Assert.Equal(double.NegativeInfinity, Margin.Of(impossible, DecisionSettings.Default).Value);
    }
}
