using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using Json.Schema;

namespace GateTasks.Engine.Tests.Contracts;

/// <summary>
/// The joint block's sliced keys, sliced-ks-max and sliced-wasserstein-max (each a mapping of worst and/or mean
/// tolerances) and projections: read as one tolerance check per stated summary, and bad shapes and values refused with
/// the documented code and place (docs/error-codes.md, GATE1003, GATE1004, GATE1005; docs/contract.md "Joint structure").
/// The schema agrees (JsonSchema.Net, JSON Schema draft 2020-12).
/// </summary>
public class SlicedJointKeyTests
{
    private static string Contract(string joint) => $$"""
        contract-version: 1
        sample: s.parquet
        reference: r.parquet
        features:
          - name: x
            checks: { ks-max: 0.05 }
          - name: y
            checks: { ks-max: 0.05 }
        joint:
          features: [x, y]
        {{joint}}
        """;

    private static GateInputException Fails(string text) =>
        Assert.Throws<GateInputException>(() => ContractLoader.Parse(text, "c.yaml"));

    private static readonly JsonSchema Schema = JsonSchema.FromText(ContractSchema.Text);

    private static bool Valid(string yaml) =>
        Schema.Evaluate(YamlToJson.Convert(yaml), new EvaluationOptions { OutputFormat = OutputFormat.List }).IsValid;

    [Fact]
    public void Each_stated_summary_is_one_tolerance_check_of_the_block()
    {
        var text = Contract("  sliced-ks-max: { worst: 0.03, mean: 0.015 }\n  sliced-wasserstein-max: { mean: 0.02 }");
        var joint = ContractLoader.Parse(text, "c.yaml").Joint!;
        Assert.True(joint.Slices);
        Assert.False(joint.Streams);
        Assert.True(joint.Standardises);
        Assert.Equal(64, joint.Projections);
        Assert.Equal(["sliced-ks-max[worst]", "sliced-ks-max[mean]", "sliced-wasserstein-max[mean]"], joint.Checks.Select(c => c.Label));
        Assert.Equal(["worst", "mean", "mean"], joint.Checks.Select(c => c.RegionName));
        var worst = joint.Sliced[0];
        Assert.Equal((CheckKind.SlicedKolmogorovSmirnov, false, 0.03, 11, 27), (worst.Kind, worst.Mean, worst.Tolerance, worst.Location.Line, worst.Location.Column));
        Assert.Equal((CheckKind.SlicedWasserstein, true, 0.02, 12), (joint.Sliced[2].Kind, joint.Sliced[2].Mean, joint.Sliced[2].Tolerance, joint.Sliced[2].Location.Line));
        Assert.True(Valid(text));

        var k = ContractLoader.Parse(Contract("  sliced-wasserstein-max: { worst: 0.05 }\n  projections: 16"), "c.yaml").Joint!;
        Assert.Equal(16, k.Projections);
        Assert.True(Valid(Contract("  sliced-wasserstein-max: { worst: 0.05 }\n  projections: 16")));
    }

    [Theory]
    [InlineData("sliced-ks-max: 0.03", ErrorCodes.ContractBadValue, "joint.sliced-ks-max takes a mapping of tolerances", 11, 18)]
    [InlineData("sliced-wasserstein-max: { worst: -0.1 }", ErrorCodes.ContractBadValue, "joint.sliced-wasserstein-max.worst must be positive, got -0.1.", 11, 36)]
    [InlineData("sliced-ks-max: { mean: 0 }", ErrorCodes.ContractBadValue, "joint.sliced-ks-max.mean must be positive, got 0.", 11, 26)]
    [InlineData("sliced-ks-max: { median: 0.01 }", ErrorCodes.ContractUnknownKey, "Unknown key 'median' in joint.sliced-ks-max", 11, 20)]
    [InlineData("sliced-ks-max: { }", ErrorCodes.ContractMissingKey, "joint.sliced-ks-max needs worst, mean or both.", 11, 18)]
    [InlineData("sliced-ks-max: { worst: lots }", ErrorCodes.ContractBadValue, "joint.sliced-ks-max.worst must be a finite number, got 'lots'", 11, 27)]
    [InlineData("sliced-ks-max: { worst: 0.03 }\n  projections: 3", ErrorCodes.ContractBadValue, "joint.projections must be between 4 and 256, got 3.", 12, 16)]
    [InlineData("sliced-ks-max: { worst: 0.03 }\n  projections: 1000", ErrorCodes.ContractBadValue, "joint.projections must be between 4 and 256, got 1000.", 12, 16)]
    [InlineData("frechet-max: 0.03\n  projections: 32", ErrorCodes.ContractBadValue, "joint.projections sets the directions of sliced-ks-max and sliced-wasserstein-max; the block states neither.", 12, 16)]
    public void Bad_shapes_and_values_are_refused_where_they_stand(string lines, string code, string message, int line, int column)
    {
        var e = Fails(Contract("  " + lines));
        Assert.Equal(code, e.Code);
        Assert.Contains(message, e.Message);
        Assert.Equal(new SourceLocation("c.yaml", line, column), e.Location);
        Assert.False(Valid(Contract("  " + lines)));
    }
}
