using System.Globalization;
using System.Text.Json.Nodes;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// kernel-distance-max on the sample's seeded subsample (joint.kernel-rows) through the command line: its value on the
/// fixed data set against numpy on exactly the rows the hash keeps, the same bits from shards as from one pass, the
/// row counts in the reports, the refusal of bad kernel-rows values and of a version 8 partial.
/// </summary>
public sealed class KernelSubsampleCheckTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-kernel-subsample-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private const string Contract = """
        contract-version: 1
        sample: { path: SAMPLE, weight: w }
        reference: reference.parquet
        features:
          - name: a
            checks: { ks-max: 0.5 }
          - name: b
            checks: { ks-max: 0.5 }
          - name: c
            checks: { ks-max: 0.5 }
        joint:
          features: [a, b, c]
          frechet-max: 0.05
          kernel-distance-max: 0.2
          kernel-rows: 1000
        """;

    private string Setup(string sample) => JointTestData.FixedDataSet(_dir, Contract.Replace("SAMPLE", sample));

    private static double Number(string s) => double.Parse(s, CultureInfo.InvariantCulture);

    private static JsonNode Fixture() =>
        JsonNode.Parse(File.ReadAllText(Path.Combine(RepositoryRoot.Path, "tests", "fixtures", "scipy", "joint_distance.json")))!;

    [Fact]
    public void On_1000_of_4000_rows_the_distance_is_numpys_on_the_rows_the_hash_keeps()
    {
        var contractPath = Setup("sample.csv");
        var junit = Path.Combine(_dir, "gate.xml");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--junit", junit);
        Assert.True(code is 0 or 1 or 5, stdout + stderr);
        var kernel = JointTestData.Cases(junit, "joint(a,b,c)")["kernel-distance-max"];
        var expected = Fixture()["kernel_subsample"]!;
        // tests/fixtures/scipy/joint_distance.json "kernel_subsample" (make_joint_distance_fixtures.py, numpy 1.24.2): the
        // row hash recomputed in numpy uint64 arithmetic, the rows with (hash >> 4) ≤ the 1000th smallest kept, MMD²ᵤ of
        // every reference row against them from the full kernel matrices, and numpy.std(ddof=1)/4 of the 16 block
        // estimates (sample blocks hash & 15).
        Assert.Equal(expected["kept_rows"]!.ToString(), kernel["kernel_sample_rows"]);
        Assert.Equal("1000", kernel["kernel_rows_limit"]);
        Assert.Equal("4000", kernel["sample_rows"]);
        var estimate = Number(expected["estimate"]!.ToString());
        var se = Number(expected["standard_error"]!.ToString());
        Assert.True(Math.Abs(Number(kernel["estimate"]) - estimate) <= 1e-9 * Math.Abs(estimate), $"{kernel["estimate"]} against {estimate:R}");
        Assert.True(Math.Abs(Number(kernel["standard_error"]) - se) <= 1e-9 * se, $"{kernel["standard_error"]} against {se:R}");
        // The console says on how many rows (docs/contract.md, kernel-rows).
        Assert.Contains("sample side on 1000 of 4000 rows", stdout);
        // The same data with every row (kernel-rows above the sample): numpy's value on all 4 000 rows.
        File.WriteAllText(contractPath, Contract.Replace("SAMPLE", "sample.csv").Replace("kernel-rows: 1000", "kernel-rows: 5000"));
        (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--junit", junit);
        Assert.True(code is 0 or 1 or 5, stdout + stderr);
        kernel = JointTestData.Cases(junit, "joint(a,b,c)")["kernel-distance-max"];
        var all = Number(Fixture()["kernel"]!["estimate"]!.ToString());
        // The same fixture, "kernel": numpy on every row (as without a subsample).
        Assert.True(Math.Abs(Number(kernel["estimate"]) - all) <= 1e-9 * Math.Abs(all), $"{kernel["estimate"]} against {all:R}");
        Assert.Equal("4000", kernel["kernel_sample_rows"]);
    }

    [Fact]
    public void Fill_merge_and_check_from_partials_keep_the_same_rows_and_give_the_same_bits()
    {
        var contractPath = Setup("shard-*.csv");
        var lines = File.ReadAllLines(Path.Combine(_dir, "sample.csv"));
        int[] cuts = [1, 700, 2900, lines.Length];
        for (var k = 0; k < 3; k++)
            File.WriteAllLines(Path.Combine(_dir, $"shard-{k}.csv"), lines.Take(1).Concat(lines[cuts[k]..cuts[k + 1]]));
        var whole = Path.Combine(_dir, "whole.xml");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--junit", whole);
        Assert.True(code is 0 or 1 or 5, stdout + stderr);
        for (var k = 0; k < 3; k++)
        {
            (code, stdout, stderr) = Cli.Run("fill", "--contract", contractPath, "--sample", Path.Combine(_dir, $"shard-{k}.csv"), "--output", Path.Combine(_dir, $"part-{k}.partial"));
            Assert.True(code == 0, stdout + stderr);
        }
        (code, stdout, stderr) = Cli.Run("merge", "--contract", contractPath, "--output", Path.Combine(_dir, "ab.partial"), Path.Combine(_dir, "part-2.partial"), Path.Combine(_dir, "part-0.partial"));
        Assert.True(code == 0, stdout + stderr);
        var fanned = Path.Combine(_dir, "fanned.xml");
        (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--partials", Path.Combine(_dir, "part-1.partial"), Path.Combine(_dir, "ab.partial"), "--junit", fanned);
        Assert.True(code is 0 or 1 or 5, stdout + stderr);
        // The program compared with itself: the kept rows depend on the values alone and are summed in one canonical
        // order, so every kernel number is the same to the last digit printed (docs/shards.md).
        var a = JointTestData.Cases(whole, "joint(a,b,c)")["kernel-distance-max"];
        var b = JointTestData.Cases(fanned, "joint(a,b,c)")["kernel-distance-max"];
        foreach (var number in new[] { "estimate", "standard_error", "block_mean", "upper_bound", "kernel_sample_rows", "verdict" })
            Assert.True(a[number] == b[number], $"{number}: one pass {a[number]}, shards {b[number]}");
        Assert.Equal("1000", b["kernel_sample_rows"]);
        // A partial holds at most K kept rows (plus ties), whatever its shard's size: 2 200 rows filled, 1 000 kept.
        var part = JsonNode.Parse(File.ReadAllText(Path.Combine(_dir, "part-1.partial")))!;
        var subsample = part["content"]!["accumulation"]!["joint_moments"]!["kernel_subsample"]!;
        Assert.Equal(1000, subsample["counts"]!.AsArray().Sum(c => c!.GetValue<long>()));
        Assert.Equal(3000, subsample["values"]!.AsArray().Count);
    }

    [Theory]
    [InlineData("kernel-rows: 999", "(15,16): error GATE1004: joint.kernel-rows must be a whole number between 1000 and 200000, got 999.")]
    [InlineData("kernel-rows: 200001", "(15,16): error GATE1004: joint.kernel-rows must be a whole number between 1000 and 200000, got 200001.")]
    [InlineData("kernel-rows: 1500.5", "(15,16): error GATE1004: joint.kernel-rows must be a whole number, got '1500.5'.")]
    [InlineData("kernel-rows: all", "(15,16): error GATE1004: joint.kernel-rows must be a whole number, got 'all'.")]
    public void Bad_kernel_rows_are_refused_at_their_line_and_column(string line, string message)
    {
        var contractPath = Setup("sample.csv");
        File.WriteAllText(contractPath, Contract.Replace("SAMPLE", "sample.csv").Replace("kernel-rows: 1000", line));
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath);
        // docs/error-codes.md: GATE1004, a bad value, at its place in the contract; exit 2.
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("precision-contract.yaml" + message, stderr);
        Assert.DoesNotContain("   at ", stdout + stderr);
    }

    [Fact]
    public void Kernel_rows_without_a_kernel_distance_is_refused()
    {
        var contractPath = Setup("sample.csv");
        File.WriteAllText(contractPath, Contract.Replace("SAMPLE", "sample.csv").Replace("  kernel-distance-max: 0.2\n", ""));
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath);
        // docs/error-codes.md: GATE1004 at the key's value.
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("precision-contract.yaml(14,16): error GATE1004: joint.kernel-rows sets how many sample rows kernel-distance-max is computed on", stderr);
    }

    [Fact]
    public void A_version_8_partial_is_refused_and_must_be_filled_again()
    {
        var contractPath = Setup("sample.csv");
        var partial = Path.Combine(_dir, "sample.partial");
        var (code, stdout, stderr) = Cli.Run("fill", "--contract", contractPath, "--sample", Path.Combine(_dir, "sample.csv"), "--output", partial);
        Assert.True(code == 0, stdout + stderr);
        // A partial as version 8 wrote it: the sample's kernel sums in place of its kept rows.
        var json = JsonNode.Parse(File.ReadAllText(partial))!.AsObject();
        var moments = json["content"]!["accumulation"]!["joint_moments"]!.AsObject();
        moments.Remove("kernel_subsample");
        moments["kernel_sums"] = new JsonArray();
        json["version"] = 8;
        File.WriteAllText(partial, json.ToJsonString());
        (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--partials", partial);
        // docs/error-codes.md: GATE2201, a partial of another version, filled again.
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("error GATE2201", stderr);
        Assert.Contains("Partial file version 8; this GateTasks reads version 10", stderr);
        Assert.Contains("the kernel distance's subsample rows", stderr);
        Assert.Contains("fill it again", stderr);
    }

    [Fact]
    public void A_partial_filled_with_another_kernel_rows_is_refused()
    {
        var contractPath = Setup("sample.csv");
        var partial = Path.Combine(_dir, "sample.partial");
        var (code, stdout, stderr) = Cli.Run("fill", "--contract", contractPath, "--sample", Path.Combine(_dir, "sample.csv"), "--output", partial);
        Assert.True(code == 0, stdout + stderr);
        File.WriteAllText(contractPath, Contract.Replace("SAMPLE", "sample.csv").Replace("kernel-rows: 1000", "kernel-rows: 2000"));
        (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--partials", partial);
        // docs/error-codes.md: GATE2202, a partial made for another contract (its fingerprint holds kernel-rows).
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("error GATE2202", stderr);
        Assert.Contains("kernel-rows", stderr);
    }
}
