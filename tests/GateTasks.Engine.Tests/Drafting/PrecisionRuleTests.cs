using GateTasks.Engine.Drafting;

namespace GateTasks.Engine.Tests.Drafting;

/// <summary>The fraction rule's tolerances against hand computation (the formulas are in PrecisionRule's summary).</summary>
public class PrecisionRuleTests
{
    private static readonly PrecisionRule Rule = new(10_000);

    [Fact]
    public void Tolerances_are_the_formulas_rounded_down_to_two_digits()
    {
        // Hand computation: (1/3)·√(20/10⁴) = 0.014907 → 0.014; (1/3)·0.5/100 = 0.0016667 → 0.0016;
        // (1/3)/100 = 0.0033333 → 0.0033; (1/3)·√(2/(4·10⁴)) = 0.0023570 → 0.0023 (normal kurtosis 3);
        // (1/3)·√(0.5·0.5/10⁴) = 0.0016667 → 0.0016; 1·√(20/10⁴) = 0.044721 → 0.044.
        Assert.Equal(0.014, Rule.BinRatio(1.0 / 3, 20).Value);
        Assert.Equal(0.0016, Rule.CdfDistance(1.0 / 3).Value);
        Assert.Equal(0.0033, Rule.MeanShift(1.0 / 3).Value);
        Assert.Equal(0.0023, Rule.WidthRatio(1.0 / 3, 3).Value);
        Assert.Equal(0.0016, Rule.Fraction(1.0 / 3, 0.5, "a category").Value);
        Assert.Equal(0.044, Rule.BinRatio(1, 20).Value);
    }

    [Fact]
    public void Every_tolerance_says_how_it_was_derived()
    {
        var t = Rule.BinRatio(1.0 / 3, 20);
        Assert.Equal("1/3 × √(20 bins / 10000 data events): the data's relative uncertainty in one equal-probability bin", t.Derivation);
        Assert.Contains("κ = 3", Rule.WidthRatio(1.0 / 3, 3).Derivation);
    }

    [Theory]
    [InlineData(0.29, 0.29)]       // 0.29/0.01 is 28.999999999999996 in doubles: must not become 0.28
    [InlineData(0.0149, 0.014)]
    [InlineData(1.0, 1.0)]
    [InlineData(0.1, 0.1)]
    [InlineData(123.9, 120)]
    [InlineData(0.00709, 0.007)]
    public void Rounding_is_down_to_two_significant_digits(double value, double expected) =>
        Assert.Equal(expected, PrecisionRule.RoundDown(value));
}
