using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Drafting;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Drafting;

/// <summary>
/// The floors of drafted tolerances against the reference's noise, for a 400 000-event unit-weight reference, 20
/// bins, a 0.90 core and a draft of 11 checks (β = 0.05/11), against numbers computed outside the engine with
/// scipy 1.10.1 / numpy 1.24.2 (the calls are beside each assertion).
/// </summary>
public class ReferenceNoiseFloorTests
{
    private const int Events = 400_000;
    private static readonly DraftOptions Options = new(10_000);
    private static readonly ReferenceNoiseFloor Floor = new(0.95, 11);

    private static ColumnProfile Continuous(double kurtosis = 3) =>
        new("x", SampleValueType.Float64, new FeatureSummary(Events, Events, Events, 0, 1, -5, 5, 0, kurtosis), false, null, null, 0);

    private static FeatureDraft Draft(params (CheckKind, string?, double)[] tolerances) =>
        new("x", FeatureKind.Continuous, "continuous", null, null, tolerances.Select(t => (t.Item1, t.Item2, new DraftedTolerance(t.Item3, "rule"))).ToList(), null);

    [Fact]
    public void Each_floor_is_the_reference_part_of_its_check_at_the_draft_wide_miss_share()
    {
        var p = Continuous();
        var f = Draft();
        // (norm.ppf(0.95) + norm.ppf(1 - 0.05/11/2)) / np.sqrt(400000) = 0.007087376602560234
        Assert.Equal(0.007087376602560234, Floor.Of(CheckKind.MeanShift, null, p, f, Options).Value, 1e-12);
        // np.sqrt(np.log(2/0.025)/(2*400000)) + np.sqrt(np.log(2/(0.05/11))/(2*400000)) = 0.005098758290551771 (DKW, Massart 1990)
        Assert.Equal(0.005098758290551771, Floor.Of(CheckKind.KolmogorovSmirnov, null, p, f, Options).Value, 1e-12);
        // 18 core bins of 20: (norm.ppf(0.95) + norm.ppf(1 - 0.05/11/2/18)) * np.sqrt(20/400000) = 0.037508753959740376
        Assert.Equal(0.037508753959740376, Floor.Of(CheckKind.BinRatio, ContractKeys.Core, p, f, Options).Value, 1e-12);
        // width: the mean's floor × √((κ − 1)/4) = √(1/2) for κ = 3 (hand computation)
        Assert.Equal(0.007087376602560234 * Math.Sqrt(0.5), Floor.Of(CheckKind.WidthRatio, null, p, f, Options).Value, 1e-12);
    }

    [Fact]
    public void A_tolerance_below_its_floor_is_widened_with_the_numbers_one_above_is_kept_and_one_with_a_floor_of_one_dropped()
    {
        var drafted = Draft((CheckKind.KolmogorovSmirnov, null, 0.0016), (CheckKind.MeanShift, null, 0.5));
        var applied = Floor.Apply(drafted, Continuous(), Options);
        var ks = applied.Tolerances.Single(t => t.Check == CheckKind.KolmogorovSmirnov).Tolerance;
        Assert.Equal(0.0051, ks.Value); // 0.0050988 rounded up to two significant digits (hand computation)
        Assert.StartsWith("widened from 0.0016 (rule), which no surrogate could pass", ks.Derivation);
        Assert.Contains("n_ref = 400000", ks.Derivation);
        Assert.Equal(0.5, applied.Tolerances.Single(t => t.Check == CheckKind.MeanShift).Tolerance.Value);

        // A 4-event reference: the KS floor √(ln 80/8) + √(ln 440/8) = 0.74 + 0.87 and the mean shift's
        // (1.645 + 2.838)/√4 = 2.24 are both above 1, so both checks are dropped (hand computation).
        var tiny = new ColumnProfile("x", SampleValueType.Float64, new FeatureSummary(4, 4, 4, 0, 1, -1, 1, 0, 3), false, null, null, 0);
        var dropped = Floor.Apply(drafted, tiny, Options);
        Assert.NotNull(dropped.SkipReason);
        Assert.Contains("every check is below the reference's own noise", dropped.SkipReason);
        Assert.Empty(dropped.Tolerances);
    }

    [Theory]
    [InlineData(0.0050988, 0.0051)]
    [InlineData(0.0051, 0.0051)]
    [InlineData(0.29, 0.29)]       // 0.29/0.01 is 28.999999999999996 in doubles: must stay 0.29
    [InlineData(0.0370001, 0.038)]
    [InlineData(123.1, 130)]
    public void Floors_are_rounded_up_to_two_significant_digits(double value, double expected) =>
        Assert.Equal(expected, ReferenceNoiseFloor.RoundUp(value));
}
