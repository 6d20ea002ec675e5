using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Tests.Checks;

public class BinRatioCheckTests
{
    private static readonly SourceLocation At = new("c.yaml", 3, 5);

    private static FeatureComparison Comparison(double[] reference, double[] surrogate, bool[] core)
    {
        var axis = new RegularAxis(reference.Length, 0, reference.Length);
        Histogram Make(double[] bins)
        {
            var cells = new double[bins.Length + 2];
            bins.CopyTo(cells, 1);
            return Histogram.FromCells(axis, cells, cells, (long)bins.Sum(), 0, 0, 0);
        }
        var spec = new FeatureSpec("x", "x", FeatureKind.Continuous, new BinningSpec(BinningMode.Quantile, 3, 0, 0, [], At),
            new CoreSpec(0.05, 0.95, At), [], At, At);
        var summary = new FeatureSummary(1, 1, 1, 0, 1, 0, 1, 0);
        var rf = new ReferenceFeature("x", "x", FeatureKind.Continuous, "quantile:3", Make(reference), summary, []);
        return new FeatureComparison(spec, rf, Make(surrogate), summary, core);
    }

    [Fact]
    public void Worked_example_by_hand()
    {
        // Reference [100, 200, 100] (total 400), surrogate [55, 100, 45] (total 200). Normalised ratios, by hand:
        // (55/200)/(100/400) = 1.1, (100/200)/(200/400) = 1.0, (45/200)/(100/400) = 0.9.
        var c = Comparison([100, 200, 100], [55, 100, 45], [false, true, false]);
        var all = BinRatioCheck.Evaluate(c, new CheckSpec(CheckKind.BinRatio, Region.All, 0.05, At));
        Assert.Equal(0.1, all.Value, 12);
        Assert.Equal(Verdict.Fail, all.Verdict);
        var core = BinRatioCheck.Evaluate(c, new CheckSpec(CheckKind.BinRatio, Region.Core, 0.05, At));
        Assert.Equal(0.0, core.Value, 12);
        Assert.Equal(Verdict.Pass, core.Verdict);
        var tails = BinRatioCheck.Evaluate(c, new CheckSpec(CheckKind.BinRatio, Region.Tails, 0.11, At));
        Assert.Equal(0.1, tails.Value, 12);
        Assert.Equal(Verdict.Pass, tails.Verdict);
        Assert.Equal(0.01, tails.Margin, 12);
    }

    [Fact]
    public void An_empty_region_fails_loudly_instead_of_passing()
    {
        var c = Comparison([100, 200, 100], [50, 100, 50], [true, true, true]);
        var tails = BinRatioCheck.Evaluate(c, new CheckSpec(CheckKind.BinRatio, Region.Tails, 0.1, At));
        Assert.Equal(Verdict.Fail, tails.Verdict);
        Assert.Contains("no bin", tails.Summary);
    }

    [Fact]
    public void Bins_empty_in_the_reference_are_counted_apart()
    {
        var c = Comparison([100, 0, 100], [50, 7, 50], [true, true, true]);
        var o = BinRatioCheck.Evaluate(c, new CheckSpec(CheckKind.BinRatio, Region.All, 0.1, At));
        Assert.Contains(o.Details, d => d.Key == "bins_empty_in_reference" && d.Value == "1");
        Assert.Equal(2, int.Parse(o.Details.Single(d => d.Key == "bins_compared").Value));
    }
}
