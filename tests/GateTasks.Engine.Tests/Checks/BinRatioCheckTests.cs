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
        // Counts this small are judged by the exact conditional binomial (Cousins, Linnemann & Tucker 2008): given
        // N = 55 + 100, the surrogate's count is Binomial(N, π), π = ρ·200/(ρ·200 + 400). One-sided 95% Clopper-Pearson
        // bounds on π, mapped to ρ = π·400/((1 − π)·200), from scipy 1.10.1: scipy.stats.beta.ppf(0.05, 55, 101) and
        // beta.ppf(0.95, 56, 100) give ρ in [0.82053146, 1.46614083]; the upper bound of |ρ − 1| is 0.46614083, the
        // largest of the three bins (the others: 0.23031262 and 0.34368070, same calls).
        Assert.Equal(0.46614083, all.Upper, 7);
        Assert.Equal(0, all.Lower, 12);
        var core = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Core, 0.05, At), Decision);
        Assert.Equal(0.0, core.Estimate, 12);
        Assert.Equal(0.23031262, core.Upper, 7); // scipy.stats.beta.ppf(0.95, 101, 200), mapped to ρ as above
        var tails = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Tails, 0.11, At), Decision);
        Assert.Equal(0.1, tails.Estimate, 12);
        // Too few events to decide against 11%: neither shown within nor outside, and more events would tell.
        Assert.True(tails.Upper > 0.11);
        Assert.True(tails.PValue > 0.5);
        var needed = NeededEvents.For(new FeatureSubject(c.Spec), new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Tails, 0.11, At), tails, Decision, 1, 0);
        Assert.True(needed.Events > 200, $"{needed}");
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
    public void An_empty_region_is_undecided_with_its_reason_never_passed_nor_failed()
    {
        // docs/checks: an effect that cannot be computed is inconclusive with its reason, not a p-value of 0.
        var c = Comparison([100, 200, 100], [50, 100, 50], [true, true, true]);
        var spec = new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Tails, 0.1, At);
        var tails = BinRatioCheck.Evaluate(c, spec, Decision);
        Assert.Contains("no bin", tails.Summary);
        Assert.StartsWith("cannot be computed", tails.Summary);
        var verdicts = VerdictRule.Decide([(new FeatureSubject(c.Spec), spec, tails)], Decision);
        Assert.Equal(Verdict.Inconclusive, verdicts[0].Verdict);
    }

    [Fact]
    public void A_sparse_bin_a_faithful_surrogate_leaves_empty_is_not_a_failure()
    {
        // Reference 10 events of 100 000 in the last bin; a surrogate of 20 000 events expects 2 there and has none
        // (Poisson probability e⁻² ≈ 14%). At the edge of a 50% tolerance (ρ = 0.5) the conditional binomial gives
        // P(X ≤ 0 | N = 10, π = 0.5·20000/(0.5·20000 + 100000)) = 0.38554329 (scipy 1.10.1: scipy.stats.binom.cdf(0, 10,
        // 0.0909090909090909), frozen in tests/fixtures/scipy/poisson_ratio.json).
        var c = Comparison([49_990, 50_000, 10], [10_000, 10_000, 0], [true, true, false]);
        var spec = new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Tails, 0.5, At);
        var tails = BinRatioCheck.Evaluate(c, spec, Decision);
        Assert.Equal(1.0, tails.Estimate, 12);
        Assert.Equal(0.38554329, tails.PValue, 7);
        var verdicts = VerdictRule.Decide([(new FeatureSubject(c.Spec), spec, tails)], Decision);
        Assert.Equal(Verdict.Inconclusive, verdicts[0].Verdict);
    }

    [Fact]
    public void A_large_bin_is_judged_at_the_expected_count_of_the_ratio_tested()
    {
        // 10⁵ reference events in a bin of 4·10⁵, 10 000 surrogate events of 10⁵ in it (ratio 0.4, tolerance 0.5):
        // more than 1000 effective events, so the normal form with σ at the edge ρ₀ = 0.5 of the tolerance:
        // σ² = ρ₀/(f·nₛ) + ρ₀²/n_ref,bin = 0.5/(0.25·10⁵) + 0.25/10⁵ = 2.25·10⁻⁵, z = (0.5 − 0.4)/0.0047434165 = 21.08,
        // by hand; p = Φ(−21.08) ≈ 6·10⁻⁹⁹ (standard normal). The observed-count σ (0.4·√(1/10⁴ + 1/10⁵)) would be
        // smaller; either way this fails, so the check is on the value: Φ(−21.0818511).
        var c = Comparison([100_000, 300_000], [10_000, 90_000], [false, true]);
        var m = BinRatioCheck.Evaluate(c, new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.Tails, 0.5, At), Decision);
        Assert.Equal(0.6, m.Estimate, 12);
        var expected = MathNet.Numerics.Distributions.Normal.CDF(0, 1, -0.1 / Math.Sqrt(2.25e-5)); // MathNet.Numerics 5
        Assert.Equal(1, m.PValue / expected, 6);
    }

    [Fact]
    public void A_common_event_weight_changes_nothing()
    {
        // Compares the program with itself: every event of both samples weighted 2.5 (Σw = 2.5·n, Σw² = 6.25·n) has the
        // same Kish effective counts as unit weights, so the exact (small bins) and score (large bins) forms must give the
        // same bounds and p-values.
        var unit = Comparison([20, 3_000, 5], [0, 1_480, 4], [false, true, false]);
        var weighted = unit with
        {
            Reference = unit.Reference with { Histogram = Scaled(unit.Reference.Histogram, 2.5) },
            Surrogate = Scaled(unit.Surrogate, 2.5),
        };
        var spec = new RegionToleranceCheck(CheckKind.BinRatio, CheckRegion.All, 0.3, At);
        var a = BinRatioCheck.Evaluate(unit, spec, Decision);
        var b = BinRatioCheck.Evaluate(weighted, spec, Decision);
        Assert.Equal(a.Upper, b.Upper, 9);
        Assert.Equal(a.PValue, b.PValue, 9);
    }

    private static Histogram Scaled(Histogram h, double w)
    {
        var sumW = h.SumW.ToArray().Select(x => x * w).ToArray();
        var sumW2 = h.SumW2.ToArray().Select(x => x * w * w).ToArray();
        return Histogram.FromCells(h.Axis, sumW, sumW2, h.Entries, 0, 0, 0);
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
