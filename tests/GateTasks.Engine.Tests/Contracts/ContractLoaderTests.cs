using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Tests.Contracts;

public class ContractLoaderTests
{
    private const string Minimal = """
        contract-version: 1
        sample: s.parquet
        reference: r.parquet
        defaults:
          checks:
            ks-max: 0.01
            ratio-max: { core: 0.02, tails: 0.1 }
        features:
          - name: x
          - name: y
            column: y_col
            checks:
              ks-max: off
              ratio-max: { tails: 0.2 }
          - name: n
            kind: discrete
            checks:
              ratio-max: 0.05
        """;

    private static GateInputException Fails(string text) =>
        Assert.Throws<GateInputException>(() => ContractLoader.Parse(text, "c.yaml"));

    /// <summary>A feature's ratio-max checks, one per region.</summary>
    private static List<RegionToleranceCheck> Ratios(FeatureSpec feature) =>
        feature.Checks.OfType<RegionToleranceCheck>().Where(k => k.Kind == CheckKind.BinRatio).ToList();

    [Fact]
    public void Nesting_deep_enough_to_overflow_the_stack_is_refused_where_it_starts()
    {
        // 200 000 nested flow sequences: loaded into nodes this overflowed the stack and killed the process.
        var deep = Minimal.Replace("ratio-max: 0.05", "ratio-max: " + new string('[', 200_000) + new string(']', 200_000));
        var e = Fails(deep);
        Assert.Equal(ErrorCodes.ContractSyntax, e.Code);
        Assert.Contains("nests more than 64 levels", e.Message);
        Assert.Equal(18, e.Location?.Line);
    }

    [Fact]
    public void An_alias_expansion_bomb_is_refused_and_a_few_aliases_are_not()
    {
        // Ten levels of ten aliases each would stand for 10^10 values once expanded.
        var bomb = string.Join("\n", Enumerable.Range(1, 10).Select(i => $"    b{i}: &b{i} [{string.Join(", ", Enumerable.Repeat(i == 1 ? "0" : $"*b{i - 1}", 10))}]"));
        var e = Fails(Minimal.Replace("defaults:\n", "defaults:\n  regions:\n" + bomb + "\n"));
        Assert.Equal(ErrorCodes.ContractSyntax, e.Code);
        Assert.Contains("would stand for more than 100000 values", e.Message);

        // A shared block written once and referred to twice still loads.
        var shared = Minimal.Replace("            ratio-max: { core: 0.02, tails: 0.1 }", "            ratio-max: &ratio { core: 0.02, tails: 0.1 }")
            .Replace("              ratio-max: { tails: 0.2 }", "              ratio-max: *ratio");
        var c = ContractLoader.Parse(shared, "c.yaml");
        Assert.Equal(3, c.Features.Count);
    }

    [Fact]
    public void Demo_contract_loads_with_defaults_applied()
    {
        var c = ContractLoader.Parse(DemoContract.Text, "demo.yaml");
        Assert.Equal("demo-diphoton", c.Title);
        Assert.Equal("weight", c.Sample.Weight);
        Assert.Equal("m_gg > 65 && m_gg < 180", c.Selection!.Text);
        FeatureSpec F(string name) => c.Features.Single(f => f.Name == name);
        var mgg = F("m_gg");
        Assert.Equal(30, Assert.IsType<QuantileBinning>(mgg.Binning).Bins);
        Assert.Equal(0.03, Ratios(mgg).Single(k => k.Region.Kind == Region.Core).Tolerance);
        Assert.Equal(0.08, Ratios(mgg).Single(k => k.Region.Kind == Region.Tails).Tolerance);
        Assert.Equal(0.06, Ratios(mgg).Single(k => k.Region.Kind == Region.Named).Tolerance);
        var pt = F("pt_gg");
        Assert.Equal(10, Assert.IsType<QuantileBinning>(pt.Binning).Bins);
        Assert.Equal(0.05, pt.Core.LowerQuantile, 12);
        Assert.Equal(0.95, pt.Core.UpperQuantile, 12);
        // The category block: one feature per jet multiplicity, each under its condition, and their fractions.
        Assert.Equal("(min(n_jets, 2)) == 1", F("pt_gg[category=1]").Condition!.Text);
        Assert.Equal(FeatureKind.Discrete, F("pt_gg[category]").Kind);
        Assert.Equal("abs(atan2(sin(phi_lead - phi_sublead), cos(phi_lead - phi_sublead)))", F("delta_phi").Expression);
        Assert.Equal(0.0, F("jet1_pt").Spike);
        var converted = F("converted");
        Assert.Equal(FeatureKind.Discrete, converted.Kind);
        Assert.DoesNotContain(converted.Checks, k => k.Kind is CheckKind.KolmogorovSmirnov or CheckKind.Wasserstein);
        Assert.Equal(["e_lead~e_sublead", "e_lead~pt_gg", "e_sublead~pt_gg", "m_gg~pt_gg"], c.Pairs.Select(p => p.Name));
        Assert.Null(c.Joint); // the demo uses effect checks only: its joint block held only the energy test, a diagnostic
        Assert.Equal("demo-diphoton-response", ContractLoader.Parse(DemoContract.ResponseText, "response.yaml").Title);
    }

    [Fact]
    public void Feature_overrides_merge_with_defaults_per_region_and_off_removes_a_check()
    {
        var c = ContractLoader.Parse(Minimal, "c.yaml");
        var x = c.Features[0];
        Assert.Equal(3, x.Checks.Count);
        var y = c.Features[1];
        Assert.Equal("y_col", y.Column);
        Assert.DoesNotContain(y.Checks, k => k.Kind == CheckKind.KolmogorovSmirnov);
        Assert.Equal(0.02, Ratios(y).Single(k => k.Region.Kind == Region.Core).Tolerance);
        var tails = Ratios(y).Single(k => k.Region.Kind == Region.Tails);
        Assert.Equal(0.2, tails.Tolerance);
        Assert.Equal(new SourceLocation("c.yaml", 14, 27), tails.Location); // line 14: "      ratio-max: { tails: 0.2 }"
        var n = c.Features[2];
        Assert.Equal(Region.All, Ratios(n).Single().Region.Kind);
        Assert.DoesNotContain(Ratios(n), k => k.Region.Kind is Region.Core or Region.Tails);
    }

    [Fact]
    public void Misspelt_top_level_key_names_line_column_and_suggestion()
    {
        var e = Fails(Minimal.Replace("features:", "feautres:"));
        Assert.Equal(ErrorCodes.ContractUnknownKey, e.Code);
        Assert.Equal(new SourceLocation("c.yaml", 8, 1), e.Location);
        Assert.Contains("did you mean 'features'", e.Message);
    }

    [Fact]
    public void Misspelt_check_key_suggests_the_check()
    {
        var e = Fails(Minimal.Replace("ks-max: 0.01", "ks-mx: 0.01"));
        Assert.Equal(ErrorCodes.ContractUnknownKey, e.Code);
        Assert.Equal(6, e.Location!.Line);
        Assert.Equal(5, e.Location.Column);
        Assert.Contains("'ks-max'", e.Message);
    }

    [Fact]
    public void Wrong_types_and_ranges_are_located()
    {
        var bins = Fails(Minimal.Replace("  - name: x", "  - name: x\n    binning: { bins: many }"));
        Assert.Equal(ErrorCodes.ContractBadValue, bins.Code);
        Assert.Equal(10, bins.Location!.Line);
        Assert.Contains("whole number", bins.Message);

        var tol = Fails(Minimal.Replace("ks-max: 0.01", "ks-max: 1.5"));
        Assert.Equal(ErrorCodes.ContractBadValue, tol.Code);
        Assert.Equal(new SourceLocation("c.yaml", 6, 13), tol.Location);

        var kind = Fails(Minimal.Replace("kind: discrete", "kind: discreet"));
        Assert.Contains("did you mean 'discrete'", kind.Message);

        var features = Fails(Minimal.Replace("  - name: x\n", "  - 42\n"));
        Assert.Equal(ErrorCodes.ContractBadValue, features.Code);
    }

    [Fact]
    public void Structural_errors_have_their_own_codes()
    {
        Assert.Equal(ErrorCodes.ContractDuplicateFeature, Fails(Minimal.Replace("name: y", "name: x")).Code);
        Assert.Equal(ErrorCodes.ContractVersion, Fails(Minimal.Replace("contract-version: 1", "contract-version: 2")).Code);
        Assert.Equal(ErrorCodes.ContractMissingKey, Fails(Minimal.Replace("reference: r.parquet\n", "")).Code);
        var syntax = Fails("contract-version: 1\nsample: [unclosed\n");
        Assert.Equal(ErrorCodes.ContractSyntax, syntax.Code);
        Assert.True(syntax.Location!.Line >= 2);
        Assert.Equal(ErrorCodes.ContractBadValue,
            Fails(Minimal.Replace("    kind: discrete\n", "    kind: discrete\n    binning: { bins: 3 }\n")).Code);
    }

    [Fact]
    public void A_feature_without_any_check_is_refused_rather_than_passing_silently()
    {
        var e = Fails("contract-version: 1\nsample: s\nreference: r\nfeatures:\n  - name: x\n");
        Assert.Equal(ErrorCodes.ContractBadValue, e.Code);
        Assert.Contains("no checks", e.Message);
    }

    [Fact]
    public void Binning_forms_are_validated()
    {
        var edges = ContractLoader.Parse(Minimal.Replace("  - name: x", "  - name: x\n    binning: { edges: [0, 1, 3] }"), "c.yaml");
        Assert.IsType<EdgeBinning>(edges.Features[0].Binning);
        Assert.Equal("edges:0,1,3", edges.Features[0].Binning.Canonical);
        Assert.Equal(ErrorCodes.ContractBadValue,
            Fails(Minimal.Replace("  - name: x", "  - name: x\n    binning: { edges: [0, 2, 1] }")).Code);
        Assert.Equal(ErrorCodes.ContractMissingKey,
            Fails(Minimal.Replace("  - name: x", "  - name: x\n    binning: { bins: 5, spacing: uniform }")).Code);
        Assert.Equal(ErrorCodes.ContractBadValue,
            Fails(Minimal.Replace("  - name: x", "  - name: x\n    binning: { bins: 5, spacing: quantile, range: [0, 1] }")).Code);
    }

    [Fact]
    public void Named_regions_get_their_own_tolerances_and_unknown_ones_are_refused()
    {
        var text = Minimal.Replace("  - name: x\n", "  - name: x\n    regions:\n      peak: [1, 2]\n      top: { quantiles: [0.9, 1] }\n    checks:\n      ratio-max: { peak: 0.02, top: 0.05 }\n");
        var x = ContractLoader.Parse(text, "c.yaml").Features[0];
        Assert.Equal(2, x.Regions!.Count);
        Assert.True(x.Regions[1].ByQuantile);
        Assert.Equal(0.02, Ratios(x).Single(c => c.Region == CheckRegion.Declared("peak")).Tolerance);
        Assert.Equal("ratio-max[top]", Ratios(x).Single(c => c.Region == CheckRegion.Declared("top")).Label);
        Assert.Equal(0.02, Ratios(x).Single(c => c.Region.Kind == Region.Core).Tolerance); // the default core stays

        var e = Fails(text.Replace("peak: 0.02", "paek: 0.02"));
        Assert.Equal(ErrorCodes.ContractUnknownKey, e.Code);
        Assert.Contains("did you mean 'peak'", e.Message);
        Assert.Equal(14, e.Location!.Line); // the ratio-max line of feature x
    }

    [Fact]
    public void Missing_file_is_reported_with_its_path()
    {
        var e = Assert.Throws<GateInputException>(() => ContractLoader.Load(Path.Combine(Path.GetTempPath(), "no-such-dir", "none.yaml")));
        Assert.Equal(ErrorCodes.ContractNotFound, e.Code);
        Assert.Contains("none.yaml", e.Message);
    }

    [Fact]
    public void A_correlation_entry_over_a_list_or_all_expands_into_every_pair_once()
    {
        var listed = ContractLoader.Parse(Minimal + "\n" + """
            correlations:
              - features: [y, x, n]
                pearson-max: 0.02
            """, "c.yaml");
        Assert.Equal(["y~x", "y~n", "x~n"], listed.Pairs.Select(p => p.Name));
        Assert.All(listed.Pairs, p => Assert.Equal(0.02, p.Pearson!.Tolerance));
        Assert.All(listed.Pairs, p => Assert.Null(p.Spearman));

        var all = ContractLoader.Parse(Minimal + "\n" + """
            correlations:
              - features: all
                spearman-max: 0.03
            """, "c.yaml");
        Assert.Equal(["x~y", "x~n", "y~n"], all.Pairs.Select(p => p.Name));
        Assert.All(all.Pairs, p => Assert.Equal(new SourceLocation("c.yaml", 20, 5), p.Location));
    }

    [Fact]
    public void A_pair_declared_twice_or_a_feature_listed_twice_is_refused_where_it_is_written()
    {
        var twice = Fails(Minimal + "\n" + """
            correlations:
              - features: all
                pearson-max: 0.02
              - features: [n, x]
                spearman-max: 0.02
            """);
        Assert.Equal(ErrorCodes.ContractBadValue, twice.Code);
        Assert.Equal(new SourceLocation("c.yaml", 22, 15), twice.Location);
        Assert.Contains("n~x is already declared at line 20", twice.Message);

        var repeated = Fails(Minimal + "\n" + """
            correlations:
              - features: [x, y, x]
                pearson-max: 0.02
            """);
        Assert.Equal(new SourceLocation("c.yaml", 20, 22), repeated.Location);

        var single = Fails(Minimal + "\n" + """
            correlations:
              - features: [x]
                pearson-max: 0.02
            """);
        Assert.Contains("at least two features", single.Message);
        var scalar = Fails(Minimal + "\n" + """
            correlations:
              - features: x
                pearson-max: 0.02
            """);
        Assert.Contains("or 'all'", scalar.Message);
    }
}
