using System.Globalization;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Tests.Checks;

public class QuantileShiftCheckTests
{
    private static readonly SourceLocation At = new("c.yaml", 1, 1);

    [Fact]
    public void The_sample_quantile_is_read_to_first_order_with_the_core_side_density()
    {
        // Reference uniform on [0, 10) in 10 bins of 100; the sample has 150 in the first bin (1050 in all).
        // By hand, p = 0.05: q_r = 0.5 lies in the outermost bin, so the density is the inner neighbour's, 100/1000/1
        // = 0.1; F_s(0.5) = 75/1050 = 0.0714286; q_s ≈ 0.5 − (0.0714286 − 0.05)/0.1 = 0.2857143 (Bahadur's first order).
        var axis = new RegularAxis(10, 0, 10);
        var cells = new double[12];
        for (var i = 1; i <= 10; i++) cells[i] = 100;
        var reference = Histogram.FromCells(axis, cells, cells, 1000, 0, 0, 0);
        var sampleCells = (double[])cells.Clone();
        sampleCells[1] = 150;
        var sample = Histogram.FromCells(axis, sampleCells, sampleCells, 1050, 0, 0, 0);
        Assert.Equal(75.0 / 1050, sample.Cdf(0.5), 12);
        Assert.Equal(0.1, QuantileShiftCheck.CoreSideDensity(reference, 0.5, 0.05), 12);
        // At an edge: the bin on the core's side, or both for the median.
        Assert.Equal(100.0 / 1050, QuantileShiftCheck.CoreSideDensity(sample, 9.0, 0.9), 12);
        Assert.Equal((150.0 / 1050 + 100.0 / 1050) / 2, QuantileShiftCheck.CoreSideDensity(sample, 1.0, 0.5), 12);

        var spec = new FeatureSpec("x", "x", FeatureKind.Continuous, new UniformBinning(10, 0, 10, At),
            new CoreSpec(0.05, 0.95, At), [], At, At);
        var rf = new ReferenceFeature("x", "x", FeatureKind.Continuous, "uniform:10", reference, new FeatureSummary(1000, 1000, 1000, 5, 1, 0, 10, 0), []);
        var c = new FeatureComparison(spec, rf, sample, new FeatureSummary(1050, 1050, 1050, 5, 1, 0, 10, 0), Enumerable.Repeat(true, 10).ToList());
        var m = QuantileShiftCheck.Evaluate(c, new ToleranceCheck(CheckKind.QuantileShift, 1, At), DecisionSettings.Default);
        Assert.Equal(0.2857143, double.Parse(m.Details.Single(d => d.Key == "quantile_0.05_sample").Value, CultureInfo.InvariantCulture), 6);
        // σ_r = 1, so that is a shift of 0.2142857 σ. The median: F_s(5) = 550/1050 = 0.5238095, reference density
        // 0.1 on both sides, q_s = 5 − 0.0238095/0.1 = 4.7619048, a shift of 0.2380952 σ — the largest of the three
        // (at 0.95: F_s(9.5) = 1000/1050, q_s = 9.5 − 0.0023810/0.1, a shift of 0.0238095 σ).
        Assert.Equal(0.2380952, m.Estimate, 6);
    }
}
