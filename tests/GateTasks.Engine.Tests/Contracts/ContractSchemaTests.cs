using GateTasks.Engine.Diagnostics;
using System.Text.Json.Nodes;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using Json.Schema;

namespace GateTasks.Engine.Tests.Contracts;

/// <summary>
/// The shipped JSON Schema must agree with the loader. It is checked with JsonSchema.Net 7.4.0, an independent
/// implementation of JSON Schema draft 2020-12 (json-schema.org).
/// </summary>
public class ContractSchemaTests
{
    private static readonly JsonSchema Schema = JsonSchema.FromText(ContractSchema.Text);

    private static bool Valid(string yaml) =>
        Schema.Evaluate(YamlToJson.Convert(yaml), new EvaluationOptions { OutputFormat = OutputFormat.List }).IsValid;

    [Fact]
    public void Demo_contract_is_valid_against_the_schema()
    {
        Assert.True(Valid(DemoContract.Text));
        Assert.True(Valid(DemoContract.ResponseText));
    }

    [Theory]
    [InlineData("features:", "feautres:")]
    [InlineData("ks-max: 0.01", "ks-mx: 0.01")]
    [InlineData("contract-version: 1", "contract-version: 2")]
    [InlineData("bins: 20, spacing: quantile", "bins: 20, spacing: quantiles")]
    [InlineData("core: 0.90  ", "core: 1.5  ")]
    public void Schema_rejects_what_the_loader_rejects(string from, string to)
    {
        var broken = DemoContract.Text.Replace(from, to);
        Assert.NotEqual(DemoContract.Text, broken);
        Assert.False(Valid(broken));
        Assert.ThrowsAny<Exception>(() => ContractLoader.Parse(broken, "c.yaml"));
    }

    [Theory]
    [InlineData("rule: inverse-sqrt, full-share: 0.25", "3: { ks-max: 0.05, mean-shift-max: off }", true)]
    [InlineData("rule: sqrt", "3: { ks-max: 0.05 }", false)]
    [InlineData("rule: inverse-sqrt, full-share: 1.5", "3: { ks-max: 0.05 }", false)]
    [InlineData("rule: inverse-sqrt, at-most: 0.5", "3: { ks-max: 0.05 }", false)]
    [InlineData("rule: inverse-sqrt", "top: { ks-max: 0.05 }", false)]
    public void Schema_and_loader_agree_on_per_category_tolerances(string scaling, string perCategory, bool valid)
    {
        var text = $$"""
            contract-version: 1
            sample: s.csv
            reference: r.parquet
            features:
              - name: e
                checks: { ks-max: 0.01, mean-shift-max: 0.02 }
                categories:
                  by: e_bin
                  values: [0, 1, 2, 3]
                  share-scaling: { {{scaling}} }
                  per-category:
                    {{perCategory}}
            """;
        Assert.Equal(valid, Valid(text));
        if (valid) ContractLoader.Parse(text, "c.yaml");
        else Assert.ThrowsAny<GateInputException>(() => ContractLoader.Parse(text, "c.yaml"));
    }

    [Fact]
    public void Schema_lists_exactly_the_loaders_keys()
    {
        var root = JsonNode.Parse(ContractSchema.Text)!;
        string[] Keys(JsonNode? o) => o!["properties"]!.AsObject().Select(p => p.Key).Order().ToArray();
        var defs = root["$defs"]!;
        Assert.Equal(ContractKeys.TopLevel.Order(), Keys(root));
        Assert.Equal(ContractKeys.DefaultsKeys.Order(), Keys(root["properties"]!["defaults"]));
        Assert.Equal(ContractKeys.DecisionKeys.Order(), Keys(root["properties"]!["decision"]));
        Assert.Equal(ContractKeys.AcceptanceKeys.Order(), Keys(root["properties"]!["acceptance"]));
        Assert.Equal(ContractKeys.CorrelationKeys.Order(), Keys(root["properties"]!["correlations"]!["items"]));
        Assert.Equal(ContractKeys.JointKeys.Order(), Keys(root["properties"]!["joint"]));
        Assert.Equal(ContractKeys.FeatureKeys.Order(), Keys(defs["feature"]));
        Assert.Equal(ContractKeys.CategoryKeys.Order(), Keys(defs["feature"]!["properties"]!["categories"]));
        Assert.Equal(ContractKeys.ShareScalingKeys.Order(), Keys(defs["feature"]!["properties"]!["categories"]!["properties"]!["share-scaling"]));
        Assert.Equal(ContractKeys.BinningKeys.Order(), Keys(defs["binning"]));
        Assert.Equal(ContractKeys.CheckKeys.Order(), Keys(defs["checks"]));
        Assert.Equal(ContractKeys.SampleKeys.Order(), Keys(root["properties"]!["sample"]!["oneOf"]![1]));
    }
}
