using System.Globalization;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;
using GateTasks.Engine.Runs;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Contracts;

/// <summary>
/// Per-category tolerances of a category block (<c>per-category</c>, <c>share-scaling</c>), as docs/contract.md
/// documents them: read with their coded errors, and applied by a check.
/// </summary>
public sealed class CategoryToleranceTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-category-tolerance-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private const string Block = """
        contract-version: 1
        sample: s.csv
        reference: ref.parquet
        features:
          - name: x
            binning: { bins: 10 }
            checks: { ks-max: 0.02, mean-shift-max: 0.03, ratio-max: { core: 0.05, tails: 0.2 } }
            categories:
              by: c
              values: [0, 1, 2]

        """;

    private static FeatureSpec Category(PrecisionContract c, int value) => c.Features.Single(f => f.Name == $"x[c={value}]");

    [Fact]
    public void A_category_states_its_own_tolerances_and_switches_a_check_off()
    {
        var c = ContractLoader.Parse(Block + """
                  per-category:
                    2: { ks-max: 0.1, ratio-max: { tails: off }, mean-shift-max: off }
            """, "c.yaml");
        var two = Category(c, 2);
        Assert.Equal(["ks-max", "ratio-max[core]"], two.Checks.Select(k => k.Label));
        Assert.Equal(0.1, ((ToleranceCheck)two.Checks[0]).Tolerance);
        Assert.Equal(0.05, ((ToleranceCheck)two.Checks[1]).Tolerance);
        // The other categories keep the feature's checks.
        Assert.Equal(c.Features.Single(f => f.Name == "x").Checks, Category(c, 0).Checks);
    }

    [Theory]
    [InlineData("  per-category:\n    5: { ks-max: 0.1 }\n", ErrorCodes.CategoryNotListed, 12, 9)]
    [InlineData("  per-category:\n    one: { ks-max: 0.1 }\n", ErrorCodes.CategoryNotListed, 12, 9)]
    [InlineData("  per-category:\n    1: { width-ratio-max: 0.1 }\n", ErrorCodes.CategoryCheckNotInherited, 12, 31)]
    [InlineData("  per-category:\n    1: { ratio-max: { peak: 0.1 } }\n", ErrorCodes.CategoryCheckNotInherited, 12, 33)]
    [InlineData("  per-category:\n    1: { ks-max: 0.1 }\n    1.0: { ks-max: 0.2 }\n", ErrorCodes.CategoryRepeated, 13, 9)]
    [InlineData("  share-scaling: { rule: sqrt }\n", ErrorCodes.ShareScalingRule, 11, 30)]
    [InlineData("  share-scaling: { full-share: 0.5 }\n", ErrorCodes.ContractMissingKey, 11, 22)]
    [InlineData("  share-scaling: { rule: inverse-sqrt, full-share: 0 }\n", ErrorCodes.ShareScalingBound, 11, 56)]
    [InlineData("  share-scaling: { rule: inverse-sqrt, at-most: 0.5 }\n", ErrorCodes.ShareScalingBound, 11, 53)]
    [InlineData("  share-scaling: { rule: inverse-sqrt, widest: 2 }\n", ErrorCodes.ContractUnknownKey, 11, 44)]
    public void Bad_per_category_tolerances_are_refused_where_they_stand(string block, string code, int line, int column)
    {
        // The documented codes (docs/error-codes.md) at the offending node: the category's key, the stated tolerance,
        // the rule or bound's value, the share-scaling mapping for a missing rule.
        var text = Block + string.Join("\n", block.Split('\n').Select(l => l.Length > 0 ? "    " + l : l));
        var e = Assert.Throws<GateInputException>(() => ContractLoader.Parse(text, "c.yaml"));
        Assert.Equal(code, e.Code);
        Assert.Equal(("c.yaml", line, column), (e.Location!.File, e.Location.Line, e.Location.Column));
    }

    [Fact]
    public void A_check_widens_inherited_tolerances_by_the_square_root_of_the_share_ratio()
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, Block + """
                  share-scaling: { rule: inverse-sqrt, full-share: 0.5, at-most: 3 }
                  per-category:
                    2: { ks-max: 0.07 }
            """);
        var contract = ContractLoader.Load(contractPath);
        // c = 0 with 80% of events, c = 1 with 16%, c = 2 with 4%.
        void Write(string name, int seed)
        {
            var rng = new Xoshiro256StarStar(seed, threadSafe: false);
            File.WriteAllLines(Path.Combine(_dir, name), new[] { "x,c" }.Concat(Enumerable.Range(0, 50_000).Select(_ =>
            {
                var u = rng.NextDouble();
                return string.Create(CultureInfo.InvariantCulture, $"{Normal.Sample(rng, 0, 1):R},{(u < 0.8 ? 0 : u < 0.96 ? 1 : 2)}");
            })));
        }
        Write("full.csv", 1);
        var reference = ReferenceBuilder.Build(contract, [Path.Combine(_dir, "full.csv")], null, "test");
        ReferenceFile.Write(contract.ReferenceFullPath, reference);
        Write("s.csv", 2);
        var run = ContractRun.Run(contract);
        double Tolerance(string feature, string label) =>
            ((ToleranceCheck)run.Outcomes.Single(o => o.Subject.Name == feature && o.Check.Label == label).Check).Tolerance;
        var share1 = reference.Find("x[c=1]")!.Histogram.TotalSumW / reference.SumW;
        var share2 = reference.Find("x[c=2]")!.Histogram.TotalSumW / reference.SumW;
        Assert.InRange(share1, 0.15, 0.17);
        // docs/contract.md: × √(full-share / share), at least 1, at most at-most.
        Assert.Equal(0.02, Tolerance("x[c=0]", "ks-max"), 12);                                   // share 0.8 > 0.5: as written
        Assert.Equal(0.03 * Math.Sqrt(0.5 / share1), Tolerance("x[c=1]", "mean-shift-max"), 9);   // × 1.77
        Assert.Equal(0.2 * Math.Sqrt(0.5 / share1), Tolerance("x[c=1]", "ratio-max[tails]"), 9);
        Assert.InRange(share2, 0.035, 0.045);
        Assert.Equal(0.03 * 3, Tolerance("x[c=2]", "mean-shift-max"), 12);                       // √(0.5/0.04) = 3.5: capped at 3
        Assert.Equal(0.07, Tolerance("x[c=2]", "ks-max"), 12);                                    // its own: not scaled
        Assert.Equal(0.02, Tolerance("x", "ks-max"), 12);                                         // the feature itself
        // A perfect surrogate: nothing fails against the scaled tolerances.
        Assert.DoesNotContain(run.Outcomes, o => o.Verdict == Verdict.Fail);
    }
}
