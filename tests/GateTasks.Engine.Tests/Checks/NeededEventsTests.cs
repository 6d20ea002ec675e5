using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Reports;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// The surrogate events that would decide an inconclusive check. Expected sizes are the closed form for one normal
/// part, n′ = n·σ_s² / ((gap/(z + z_power))² − σ_r²), with the standard normal quantiles from
/// scipy.stats.norm.ppf (scipy 1.10.1): z(0.95) = 1.6448536269514722, z(0.90) = 1.2815515655446004,
/// z(1 − 0.01/20) = 3.2905267314919255; sizes computed with math.ceil in the same Python session.
/// </summary>
public class NeededEventsTests
{
    private static readonly SourceLocation At = new("c.yaml", 1, 1);

    private static FeatureSpec Feature(string name, SelectionSpec? condition = null) =>
        new(name, name, FeatureKind.Continuous, new QuantileBinning(10, At), new CoreSpec(0.05, 0.95, At), [], At, At, Condition: condition);

    private static readonly ToleranceCheck MeanShift = new(CheckKind.MeanShift, 0.03, At);

    /// <summary>One part: deviation <paramref name="d"/>, σ_ref <paramref name="sr"/>, σ_sample <paramref name="ss"/> at n = 1000 events.</summary>
    private static Measurement OnePart(double d, double sr, double ss, long events = 1000)
    {
        var effect = new EffectIntersection(MeanShift.Tolerance, DecisionSettings.Default, events);
        effect.Add(d, sr, ss);
        return effect.ToMeasurement(d, "", []);
    }

    [Fact]
    public void The_pass_side_is_solved_for_a_90_percent_chance_that_the_upper_bound_clears_the_tolerance()
    {
        var n = NeededEvents.For(new FeatureSubject(Feature("x")), MeanShift, OnePart(0.01, 0.002, 0.01), DecisionSettings.Default, 20, 1000);
        // ceil(1000·0.01² / ((0.02/(1.6448536 + 1.2815516))² − 0.002²)) = 2342 (scipy, see the class comment).
        Assert.Equal(2342, n.Events);
        Assert.Equal(DecidingSide.Pass, n.Side);
        Assert.Equal(0.9, n.Chance);
        Assert.False(n.ReferenceLimits);
        Assert.True(double.IsNaN(n.CategoryEvents));
    }

    [Fact]
    public void The_fail_side_is_solved_at_the_strictest_level_of_the_family_not_the_uncorrected_one()
    {
        var m = OnePart(0.05, 0.002, 0.01);
        var n = NeededEvents.For(new FeatureSubject(Feature("x")), MeanShift, m, DecisionSettings.Default, 20, 1000);
        // Family of 20 at α = 0.01: z = 3.2905267; ceil(1000·0.01² / ((0.02/(3.2905267 + 1.2815516))² − 0.002²)) = 6608.
        Assert.Equal(6608, n.Events);
        Assert.Equal(DecidingSide.Fail, n.Side);
    }

    [Fact]
    public void A_check_inconclusive_only_after_the_correction_still_gets_a_figure()
    {
        // p = 1 − Φ(0.02/0.0075) = 0.0038 ≤ 0.01 uncorrected, but 20 checks: Holm-adjusted 0.077, inconclusive.
        var shifted = OnePart(0.05, 0.0005, 0.0075);
        Assert.True(shifted.PValue < 0.01);
        var items = new List<(CheckSubject, CheckSpec, Measurement)> { (new FeatureSubject(Feature("x")), MeanShift, shifted) };
        for (var i = 0; i < 19; i++) items.Add((new FeatureSubject(Feature("f" + i)), MeanShift, OnePart(0, 0.0001, 0.001)));
        var o = VerdictRule.Decide(items, DecisionSettings.Default, 1000)[0];

        Assert.Equal(Verdict.Inconclusive, o.Verdict);
        Assert.True(double.IsFinite(o.Needed!.Events) && o.Needed.Events > 1000, $"{o.Needed}");
        Assert.Equal(DecidingSide.Fail, o.Needed.Side);
        Assert.Contains("surrogate events needed to decide (a 90% chance to fail", ResultTable.NeededText(o));
    }

    [Fact]
    public void A_category_states_its_own_events_and_the_whole_samples_at_its_share()
    {
        var category = new FeatureSubject(Feature("x[c=1]", new SelectionSpec("(c) == 1", At)));
        // 200 of 1000 sample events in the category: its own figure is the closed form at n = 200, the sample's five times it.
        var n = NeededEvents.For(category, MeanShift, OnePart(0.01, 0.002, 0.01, events: 200), DecisionSettings.Default, 20, 1000);
        // ceil(200·0.01² / ((0.02/(1.6448536 + 1.2815516))² − 0.002²)) = 469 (scipy), ×5 = 2345.
        Assert.Equal(469, n.CategoryEvents);
        Assert.Equal(2345, n.Events);
        Assert.Equal(0.2, n.Share, 12);
        var text = ResultTable.NeededText(n);
        Assert.Contains("≈469 events in this category needed to decide, ≈2350 surrogate events at its share of 20%", text);
    }

    [Fact]
    public void More_reference_events_only_when_no_surrogate_size_can_decide()
    {
        var x = new FeatureSubject(Feature("x"));
        // Gap 0.02 with σ_ref 0.0075: 0.02/0.0075 = 2.67 lies between z = 1.645 and z + z_power = 2.93, so a 90% chance
        // is out of reach but the estimate itself clears the bound at ceil(1000·0.01²/((0.02/1.6448536)² − 0.0075²)) = 1092.
        var capped = NeededEvents.For(x, MeanShift, OnePart(0.01, 0.0075, 0.01), DecisionSettings.Default, 20, 1000);
        Assert.False(capped.ReferenceLimits);
        Assert.Equal(1092, capped.Events);
        Assert.Equal(0.5, capped.Chance);
        Assert.Contains("more reference events would help", ResultTable.NeededText(capped));

        // σ_ref 0.013 > 0.02/1.645: the reference alone leaves no room on either side.
        var limited = NeededEvents.For(x, MeanShift, OnePart(0.01, 0.013, 0.01), DecisionSettings.Default, 20, 1000);
        Assert.True(limited.ReferenceLimits);
        Assert.Equal("more reference events needed to decide: at the effect as estimated, no surrogate sample size is enough", ResultTable.NeededText(limited));
    }

    private static readonly ToleranceCheck KsMax = new(CheckKind.KolmogorovSmirnov, 0.03, At);

    /// <summary>A ks-max measurement at distance <paramref name="d"/>: 10⁵ reference and 10⁴ sample effective events, 10⁴ sample events.</summary>
    private static Measurement Band(double d) =>
        new(d, 0, 1, 0.5, "", []) { Band = new KsBand(d, 1e5, 1e4), PartsEvents = 10_000 };

    // Expected ks-max sizes: the smallest n′ at which Φ(±(D − tol) − c·(1/√n₁ + 1/√n₂′))/(½√(1/n₁ + 1/n₂′))) reaches 0.9,
    // c = √(ln(4/0.05)/2) on the pass side and √(ln(4·10/0.01)/2) on the fail side, solved with
    // scipy.optimize.brentq and scipy.stats.norm.cdf (scipy 1.10.1) on log n′, then math.ceil.

    [Fact]
    public void A_ks_max_check_above_its_tolerance_is_sized_on_the_fail_side_at_the_strictest_level_with_power()
    {
        var n = NeededEvents.For(new FeatureSubject(Feature("x")), KsMax, Band(0.05), DecisionSettings.Default, 10, 10_000);
        Assert.Equal(42693, n.Events); // scipy, see above
        Assert.Equal(DecidingSide.Fail, n.Side);
        Assert.Equal(NeededEvents.Power, n.Chance);
    }

    [Fact]
    public void A_ks_max_check_below_its_tolerance_is_sized_on_the_pass_side_and_the_reference_can_limit_it()
    {
        var n = NeededEvents.For(new FeatureSubject(Feature("x")), KsMax, Band(0.01), DecisionSettings.Default, 10, 10_000);
        Assert.Equal(20308, n.Events); // scipy, see above
        Assert.Equal(DecidingSide.Pass, n.Side);
        // A reference of 400 effective events: its own 1/√400 = 0.05 already exceeds the room (0.02/√(ln 80/2) = 0.0135),
        // so not even an even chance is reachable at any surrogate size (scipy, as above: no root).
        var limited = new Measurement(0.01, 0, 1, 0.5, "", []) { Band = new KsBand(0.01, 400, 1e4), PartsEvents = 10_000 };
        Assert.True(NeededEvents.For(new FeatureSubject(Feature("x")), KsMax, limited, DecisionSettings.Default, 10, 10_000).ReferenceLimits);
    }
}
