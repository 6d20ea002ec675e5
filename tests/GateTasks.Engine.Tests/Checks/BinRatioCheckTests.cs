using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Accumulation;

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
        var spec = new FeatureSpec("x", "x", FeatureKind.Continuous, new QuantileBinning(3, At),
            new CoreSpec(0.05, 0.95, At), [], At, At);
        var summary = new FeatureSummary(1, 1, 1, 0, 1, 0, 1, 0);
        var rf = new ReferenceFeature("x", "x", FeatureKind.Continuous, "quantile:3", Make(reference), summary, []);
        return new FeatureComparison(spec, rf, Make(surrogate), summary, core);
    }

    private static readonly DecisionSettings Decision = DecisionSettings.Default;

    [Fact]
    public void Worked_example_by_hand()
    {
        // Reference [100, 200, 100] (total 400), surrogate [55, 100, 45] (total 200), unit weights. Normalised ratios,
        // by hand: (55/200)/(100/400) = 1.1, (100/200)/(200/400) = 1.0, (45/200)/(100/400) = 0.9.
        var c = Comparison([100, 200, 100], [55, 100, 45], [false, true, false]);
        var all = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.All, 0.05, At), Decision);
        Assert.Equal(0.1, all.Estimate, 12);
        // Delta method, hand-computed: σ(1.1) = 1.1·√(1/100 + 1/55) = 0.18466185; upper = 0.1 + z₀.₉₅·σ with
        // z₀.₉₅ = 1.6448536 (standard normal table) = 0.40374172, the largest of the three bins.
        Assert.Equal(0.40374172, all.Upper, 7);
        Assert.Equal(0, all.Lower, 12);
        var core = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Core, 0.05, At), Decision);
        Assert.Equal(0.0, core.Estimate, 12);
        Assert.Equal(0.20145260, core.Upper, 7); // 0 + 1.6448536·√(1/200 + 1/100), hand-computed
        var tails = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Tails, 0.11, At), Decision);
        Assert.Equal(0.1, tails.Estimate, 12);
        // Too few events to decide against 11%: neither shown within nor outside, and more events would tell.
        Assert.True(tails.Upper > 0.11);
        Assert.True(tails.PValue > 0.5);
        Assert.True(tails.EventsNeeded > 200);
    }

    [Fact]
    public void Large_counts_decide_both_ways()
    {
        // The same shapes with 10⁴ times the counts: σ shrinks by 100, so 10% deviations are decided.
        var c = Comparison([1e6, 2e6, 1e6], [0.55e6, 1e6, 0.45e6], [false, true, false]);
        var fails = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Tails, 0.05, At), Decision);
        Assert.True(fails.PValue < 1e-12);
        var passes = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Tails, 0.15, At), Decision);
        Assert.True(passes.Upper < 0.15);
    }

    [Fact]
    public void A_named_region_takes_the_bins_whose_centres_it_holds()
    {
        // Bins [0,1), [1,2), [2,3) with centres 0.5, 1.5, 2.5; region [1, 3] holds the last two: deviations 0 and 0.1.
        var c = Comparison([100, 200, 100], [55, 100, 45], [false, true, false]);
        c = c with { Spec = c.Spec with { Regions = [new NamedRegion("upper", 1, 3, false, At)] } };
        var m = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Declared("upper"), 0.2, At), Decision);
        Assert.Equal(0.1, m.Estimate, 12);
        Assert.Equal("2", m.Details.Single(d => d.Key == "bins_compared").Value);
    }

    [Fact]
    public void An_empty_region_fails_loudly_instead_of_passing()
    {
        var c = Comparison([100, 200, 100], [50, 100, 50], [true, true, true]);
        var spec = new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Tails, 0.1, At);
        var tails = BinRatioCheck.Evaluate(c, spec, Decision);
        Assert.Contains("no bin", tails.Summary);
        var verdicts = VerdictRule.Decide([(new FeatureSubject(c.Spec), spec, tails)], Decision);
        Assert.Equal(Verdict.Fail, verdicts[0].Verdict);
    }

    [Fact]
    public void Bins_empty_in_the_reference_are_counted_apart()
    {
        var c = Comparison([100, 0, 100], [50, 7, 50], [true, true, true]);
        var o = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.All, 0.1, At), Decision);
        Assert.Contains(o.Details, d => d.Key == "bins_empty_in_reference" && d.Value == "1");
        Assert.Equal(2, int.Parse(o.Details.Single(d => d.Key == "bins_compared").Value));
    }
}
