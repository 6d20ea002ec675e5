using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.Reports;

namespace GateTasks.Engine.Tests.Reports;

/// <summary>
/// How reports word headroom and name subjects: hand-computed cases of the documented wording (docs/reports.md), the
/// binding checks of a small run against the outcomes' own shares (the program compared with itself), and category
/// subjects labelled by their condition as the contract declares them (docs/contract.md, category blocks).
/// </summary>
public class HeadroomReportingTests
{
    [Theory]
    [InlineData(0.643, 0.5, "uses 64% of its tolerance (estimate 50%)", "64% (50%)")]
    [InlineData(1.3, 1.1, "uses 130% of its tolerance (estimate 110%)", "130% (110%)")]
    [InlineData(0.2, double.NaN, "uses 20% of its tolerance", "20%")]
    [InlineData(12.0, 11.0, "uses >1000% of its tolerance (estimate >1000%)", ">1000% (>1000%)")]
    [InlineData(0.1, -0.05, "uses 10% of its tolerance (estimate -5%)", "10% (-5%)")]
    [InlineData(double.PositiveInfinity, double.NaN, "headroom not measured", "—")]
    public void Headroom_is_worded_as_the_share_of_the_tolerance_used(double upper, double point, string words, string cell)
    {
        // Hand-computed: whole percentages of the shares (docs/reports.md, "used").
        Assert.Equal(words, HeadroomText.Of(new Headroom(upper, point)));
        Assert.Equal(cell, HeadroomText.Cell(new Headroom(upper, point)));
    }

    [Fact]
    public void A_category_is_labelled_by_its_condition_and_keeps_its_name_as_identity()
    {
        var c = ContractLoader.Parse(DemoContract.Text, "demo.yaml");
        var category = c.Features.Single(f => f.Name == "pt_gg[category=1]");
        // The demo declares the block with "by: min(n_jets, 2)"; category 1 holds the events where it equals 1.
        Assert.Equal("pt_gg[min(n_jets, 2) = 1]", SubjectLabel.Of(new FeatureSubject(category)));
        Assert.Equal("pt_gg[category=1]", new FeatureSubject(category).Name);
        Assert.Equal("pt_gg", SubjectLabel.Of(new FeatureSubject(c.Features.Single(f => f.Name == "pt_gg"))));
        Assert.Equal("e_lead~e_sublead", SubjectLabel.Of(new PairSubject(c.Pairs[0])));
    }

    [Fact]
    public void A_category_by_a_plain_column_is_labelled_with_the_column()
    {
        var c = ContractLoader.Parse("""
            contract-version: 1
            sample: s.parquet
            reference: r.parquet
            defaults:
              checks:
                ks-max: 0.01
            features:
              - name: m
                categories:
                  by: n_jets
                  values: [0, 2]
            """, "c.yaml");
        Assert.Equal("m[n_jets = 2]", SubjectLabel.Of(new FeatureSubject(c.Features.Single(f => f.Name == "m[n_jets=2]"))));
    }

    [Fact]
    public void The_binding_checks_are_the_largest_upper_shares_of_those_not_failed()
    {
        using var run = new ReportCase();
        var report = run.Run(30_000, 3, 0.3);
        var decision = report.Contract.Decision;
        Assert.Contains(report.Outcomes, o => o.Verdict == Verdict.Fail); // the test means something only with a failure to leave out

        var binding = BindingChecks.Of(report);

        var expected = report.Outcomes.Where(o => o.Verdict != Verdict.Fail).Select(o => Headroom.Of(o, decision).UpperShare)
            .Where(double.IsFinite).OrderDescending().Take(BindingChecks.Count).ToList();
        Assert.Equal(expected, binding.Select(b => b.Headroom.UpperShare));
        Assert.DoesNotContain(binding, b => b.Outcome.Verdict == Verdict.Fail);
        Assert.All(binding, b => Assert.Equal(Headroom.Of(b.Outcome, decision), b.Headroom));
    }
}
