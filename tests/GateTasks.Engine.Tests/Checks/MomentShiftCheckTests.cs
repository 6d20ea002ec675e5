using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Tests.Checks;

public class MomentShiftCheckTests
{
    private static readonly SourceLocation At = new("c.yaml", 1, 1);

    private static FeatureComparison Comparison(FeatureSummary reference, FeatureSummary sample, Histogram h)
    {
        var spec = new FeatureSpec("x", "x", FeatureKind.Continuous, new QuantileBinning(3, At),
            new CoreSpec(0.05, 0.95, At), [], At, At);
        var rf = new ReferenceFeature("x", "x", FeatureKind.Continuous, "quantile:3", h, reference, []);
        return new FeatureComparison(spec, rf, h, sample, [true, true, true]);
    }

    [Fact]
    public void Mean_shift_worked_by_hand()
    {
        // Reference mean 0, σ 1, 10⁴ unit-weight events; sample mean 0.05, σ 1, 10⁴ events. By hand: shift 0.05 σ,
        // standard error √(1/10⁴ + 1/10⁴) = 0.0141421, upper bound 0.05 + 1.6448536·0.0141421 = 0.0732617
        // (z₀.₉₅ from the standard normal table).
        var h = new Histogram(new RegularAxis(3, -3, 3));
        var c = Comparison(new FeatureSummary(10_000, 1e4, 1e4, 0, 1, -4, 4, 0), new FeatureSummary(10_000, 1e4, 1e4, 0.05, 1, -4, 4, 0), h);
        var m = MomentShiftCheck.Mean(c, new ToleranceCheck(CheckKind.MeanShift, 0.1, At), DecisionSettings.Default);
        Assert.Equal(0.05, m.Estimate, 12);
        Assert.Equal(0.0732617, m.Upper, 6);
        Assert.True(m.PValue > 0.99); // far inside 0.1
    }

    [Fact]
    public void Width_ratio_uses_the_kurtosis_of_the_reference_histogram()
    {
        // Two equal bins at ±1: a two-point distribution has kurtosis 1, so a standard deviation has no sampling
        // error in the delta method ((κ − 1)/(4n) = 0): the bound equals the estimate.
        var axis = new VariableAxis([-1.5, -0.5, 0.5, 1.5]);
        var h = Histogram.FromCells(axis, [0, 50, 0, 50, 0], [0, 50, 0, 50, 0], 100, 0, 0, 0);
        var c = Comparison(new FeatureSummary(100, 100, 100, 0, 1, -1, 1, 0), new FeatureSummary(100, 100, 100, 0, 1.1, -1, 1, 0), h);
        var m = MomentShiftCheck.Width(c, new ToleranceCheck(CheckKind.WidthRatio, 0.05, At), DecisionSettings.Default);
        Assert.Equal(0.1, m.Estimate, 12);
        Assert.Equal(0.1, m.Upper, 12);
        Assert.Contains(m.Details, d => d.Key == "kurtosis_used" && d.Value == "1");
    }
}
