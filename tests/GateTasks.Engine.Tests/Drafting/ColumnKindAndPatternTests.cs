using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Drafting;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Drafting;

/// <summary>The draft's kind rule and exclusion globs against their documented behaviour (docs/drafting.md, docs/cli.md).</summary>
public class ColumnKindAndPatternTests
{
    private static ColumnProfile Counts(int values, double step, double topShare)
    {
        var distinct = Enumerable.Range(0, values).ToDictionary(i => i * step, i => i == 0 ? topShare * 1000 : (1 - topShare) * 1000 / (values - 1));
        var summary = new FeatureSummary(1000, 1000, 1000, 5, 3, 0, (values - 1) * step, 0, 4);
        return new ColumnProfile("n", SampleValueType.Int64, summary, true, distinct, 0, topShare);
    }

    [Fact]
    public void A_whole_number_column_of_31_values_is_discrete_with_no_spike_at_its_mode()
    {
        // docs/drafting.md: at most 100 distinct values (and a span of at most 10 000) make a discrete feature.
        var f = FeatureDrafter.Draft(Counts(31, 1, 0.12), new DraftOptions(10_000));
        Assert.Equal(FeatureKind.Discrete, f.Kind);
        Assert.Null(f.Spike);
        Assert.Equal([CheckKind.Fraction], f.Tolerances.Select(t => t.Check));
    }

    [Fact]
    public void Too_many_values_or_too_wide_a_span_is_continuous()
    {
        Assert.Equal(FeatureKind.Continuous, FeatureDrafter.Draft(Counts(31, 1000, 0.12), new DraftOptions(10_000)).Kind); // spans 30 001
        Assert.Equal(FeatureKind.Continuous, FeatureDrafter.Draft(Counts(31, 1, 0.12), new DraftOptions(10_000, MaxCategories: 30)).Kind);
    }

    [Theory]
    [InlineData("gen_*", "gen_pt", true)]
    [InlineData("gen_*", "pt_gen", false)]
    [InlineData("e?a", "eta", true)]
    [InlineData("e?a", "eeta", false)]
    [InlineData("a.b", "axb", false)]   // a dot is a dot, not a regular-expression wildcard
    [InlineData("a.b", "a.b", true)]
    [InlineData("*Truth*", "isTruthMatched", true)]
    [InlineData("Gen*", "gen_pt", false)] // case-sensitive, as column names are
    public void A_glob_matches_whole_column_names(string glob, string column, bool matches) =>
        Assert.Equal(matches, new ColumnPattern(glob).Matches(column));

    [Fact]
    public void Generator_level_names_are_recognised_by_the_documented_hint()
    {
        // docs/cli.md lists the hint's globs.
        Assert.Equal("gen*", GeneratorLevelNames.Match("gen_pt"));
        Assert.Equal("*truth*", GeneratorLevelNames.Match("e_truth"));
        Assert.Equal("mc_*", GeneratorLevelNames.Match("mc_eta"));
        Assert.Null(GeneratorLevelNames.Match("jet_pt"));
    }
}
