using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Tests.Checks;

public class HeadroomTests
{
    private static readonly SourceLocation At = new("c.yaml", 1, 1);
    private static readonly CheckSubject Subject = new FeatureSubject(new("x", "x", FeatureKind.Continuous, new QuantileBinning(3, At),
        new CoreSpec(0.05, 0.95, At), [], At, At));

    [Fact]
    public void An_effect_check_uses_its_upper_bound_and_its_estimate_over_the_tolerance()
    {
        // Estimate 0.01, σ 0.002, 95% one-sided bound 0.01 + 1.6448536·0.002 = 0.0132897 (z = 1.6448536 from the
        // standard normal table); tolerance 0.02: upper share 0.0132897/0.02 = 0.6644854, point share 0.01/0.02 = 0.5
        // (arithmetic by hand).
        var upper = 0.01 + 1.6448536269514722 * 0.002;
        var o = new CheckOutcome(Subject, new ToleranceCheck(CheckKind.KolmogorovSmirnov, 0.02, At),
            new Measurement(0.01, 0.01 - 1.6448536269514722 * 0.002, upper, 1, "", []), Verdict.Pass, 1, 0.01);
        var h = Headroom.Of(o, DecisionSettings.Default);
        Assert.Equal(0.6644854, h.UpperShare, 6);
        Assert.Equal(0.5, h.PointShare, 9);
        // From the margin and noise the ledger records, the same two shares (the program compared with itself).
        var fromLedger = Headroom.FromMargin(Margin.Of(o, DecisionSettings.Default), DecisionSettings.Default.Confidence);
        Assert.Equal(h.UpperShare, fromLedger.UpperShare, 12);
        Assert.Equal(h.PointShare, fromLedger.PointShare, 12);
    }

    [Fact]
    public void A_test_uses_its_level_over_the_adjusted_p_value_and_has_no_point_share()
    {
        // Level 0.01, adjusted p 0.04: share 0.25 (by hand); at p = level the share is 1, the edge of failing.
        var test = new GoodnessOfFitTest(CheckKind.ChiSquareTest, At);
        var o = new CheckOutcome(Subject, test, new Measurement(3, double.NaN, double.NaN, 0.04, "", []), Verdict.Pass, 0.04, 0.01);
        var h = Headroom.Of(o, DecisionSettings.Default);
        Assert.Equal(0.25, h.UpperShare, 12);
        Assert.True(double.IsNaN(h.PointShare));
        Assert.Equal(1, Headroom.Of(o with { AdjustedPValue = 0.01 }, DecisionSettings.Default).UpperShare, 12);
    }

    [Fact]
    public void A_measurement_that_could_not_be_made_uses_everything()
    {
        var impossible = new CheckOutcome(Subject, new ToleranceCheck(CheckKind.KolmogorovSmirnov, 0.02, At),
            Measurement.Impossible("why", []), Verdict.Fail, 0, 0.01);
        var h = Headroom.Of(impossible, DecisionSettings.Default);
        Assert.Equal(double.PositiveInfinity, h.UpperShare);
        Assert.False(h.IsMeasured);
        Assert.True(double.IsNaN(h.PointShare));
    }
}
