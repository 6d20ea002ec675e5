using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using Json.Schema;

namespace GateTasks.Engine.Tests.Contracts;

/// <summary>
/// The joint block's tolerance keys, frechet-max and kernel-distance-max: read as tolerance checks of the block, and
/// bad values refused with the documented code and place (docs/error-codes.md, GATE1004; docs/contract.md "Joint
/// structure"). The schema agrees (JsonSchema.Net 7.4.0, JSON Schema draft 2020-12).
/// </summary>
public class JointToleranceKeyTests
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
    public void Both_keys_are_tolerance_checks_of_the_block()
    {
        var c = ContractLoader.Parse(Contract("  frechet-max: 0.02\n  kernel-distance-max: 0.001"), "c.yaml");
        var joint = c.Joint!;
        Assert.Equal((CheckKind.FrechetDistance, 0.02, 11, 16), (joint.Frechet!.Kind, joint.Frechet.Tolerance, joint.Frechet.Location.Line, joint.Frechet.Location.Column));
        Assert.Equal((CheckKind.KernelDistance, 0.001, 12), (joint.KernelDistance!.Kind, joint.KernelDistance.Tolerance, joint.KernelDistance.Location.Line));
        Assert.True(joint.Streams);
        Assert.Equal(["frechet-max", "kernel-distance-max"], joint.Checks.Select(k => k.Label));
        Assert.All(joint.Checks, k => Assert.IsType<ToleranceCheck>(k));

        Assert.True(Valid(Contract("  frechet-max: 0.02\n  kernel-distance-max: 0.001")));
    }

    [Theory]
    [InlineData("frechet-max: 0", "joint.frechet-max must be positive, got 0.", 16)]
    [InlineData("frechet-max: -0.1", "joint.frechet-max must be positive", 16)]
    [InlineData("kernel-distance-max: .nan", "joint.kernel-distance-max must be a finite number", 24)]
    [InlineData("kernel-distance-max: small", "joint.kernel-distance-max must be a finite number, got 'small'", 24)]
    public void Bad_tolerances_are_refused_where_they_stand(string line, string message, int column)
    {
        var e = Fails(Contract("  " + line));
        Assert.Equal(ErrorCodes.ContractBadValue, e.Code);
        Assert.Contains(message, e.Message);
        Assert.Equal(new SourceLocation("c.yaml", 11, column), e.Location);
        Assert.False(Valid(Contract("  " + line)));
    }

    [Fact]
    public void A_block_with_no_check_is_refused_and_a_misspelt_key_is_named()
    {
        var none = Fails("contract-version: 1\nsample: s.parquet\nreference: r.parquet\nfeatures:\n  - name: x\n    checks: { ks-max: 0.05 }\n" +
                         "  - name: y\n    checks: { ks-max: 0.05 }\njoint:\n  features: [x, y]\n");
        Assert.Equal(ErrorCodes.ContractMissingKey, none.Code);
        Assert.Contains("needs frechet-max, kernel-distance-max, sliced-ks-max, sliced-wasserstein-max or several", none.Message);
        Assert.Equal(10, none.Location!.Line); // the block's mapping starts at its first key

        var misspelt = Fails(Contract("  frechet-mx: 0.02"));
        Assert.Equal(ErrorCodes.ContractUnknownKey, misspelt.Code);
        Assert.Contains("frechet-max", misspelt.Message);
        Assert.Equal(11, misspelt.Location!.Line);
    }

    [Fact]
    public void The_kernel_distance_takes_at_most_32_features()
    {
        var names = Enumerable.Range(0, 33).Select(i => $"f{i}").ToList();
        var text = "contract-version: 1\nsample: s.parquet\nreference: r.parquet\nfeatures:\n" +
                   string.Concat(names.Select(n => $"  - name: {n}\n    checks: {{ ks-max: 0.05 }}\n")) +
                   $"joint:\n  features: [{string.Join(", ", names)}]\n  kernel-distance-max: 0.01\n";
        var e = Fails(text);
        Assert.Equal(ErrorCodes.ContractBadValue, e.Code);
        Assert.Contains("at most 32 joint features", e.Message);
        // 33 features fit frechet-max.
        Assert.NotNull(ContractLoader.Parse(text.Replace("kernel-distance-max", "frechet-max"), "c.yaml").Joint!.Frechet);
    }

    [Theory]
    [InlineData("energy-test: on", "energy-test")]
    [InlineData("subsample: 500", "subsample")]
    [InlineData("permutations: 999", "permutations")]
    public void The_retired_energy_test_keys_are_refused_with_their_own_code(string line, string key)
    {
        // docs/error-codes.md, GATE1016: the energy test on a bounded subsample was retired; its keys are named, not ignored.
        var e = Fails(Contract("  frechet-max: 0.02\n  " + line));
        Assert.Equal(ErrorCodes.ContractRetiredKey, e.Code);
        Assert.Contains($"joint.{key} was retired", e.Message);
        Assert.Contains("frechet-max", e.Message);
        Assert.Equal(new SourceLocation("c.yaml", 12, 3), e.Location);
        Assert.False(Valid(Contract("  frechet-max: 0.02\n  " + line)));
    }

    [Theory]
    [InlineData("  kernel-distance-max: 0.001", 50_000)]
    [InlineData("  kernel-distance-max: 0.001\n  kernel-rows: 1000", 1_000)]
    [InlineData("  kernel-distance-max: 0.001\n  kernel-rows: 200000", 200_000)]
    public void Kernel_rows_defaults_to_50000_and_takes_1000_to_200000(string joint, int rows)
    {
        // docs/contract.md "Joint structure": kernel-rows, default 50 000, from 1 000 to 200 000.
        Assert.Equal(rows, ContractLoader.Parse(Contract(joint), "c.yaml").Joint!.KernelRows);
        Assert.True(Valid(Contract(joint)));
    }

    [Theory]
    [InlineData("  kernel-distance-max: 0.001\n  kernel-rows: 999")]
    [InlineData("  kernel-distance-max: 0.001\n  kernel-rows: 200001")]
    [InlineData("  kernel-distance-max: 0.001\n  kernel-rows: 1500.5")]
    [InlineData("  frechet-max: 0.02\n  kernel-rows: 50000")]
    public void Bad_kernel_rows_are_refused_by_loader_and_schema(string joint)
    {
        // docs/error-codes.md: GATE1004 at the value; the schema refuses the same contracts.
        var e = Fails(Contract(joint));
        Assert.Equal(ErrorCodes.ContractBadValue, e.Code);
        Assert.Equal(12, e.Location!.Line);
        Assert.False(Valid(Contract(joint)));
    }
}
