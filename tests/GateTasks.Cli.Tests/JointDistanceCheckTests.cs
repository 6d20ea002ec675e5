using System.Globalization;
using System.Text.Json.Nodes;
using System.Xml.Linq;
using GateTasks.Engine.References;
using GateTasks.Tests.Shared;
using Parquet;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The joint block's streamed checks, frechet-max and kernel-distance-max, through the command line: their values on a
/// fixed data set against numpy and scipy, the same numbers from shards as from one pass, the verdicts on a surrogate
/// whose correlation was permuted away and on a faithful one, and the refusals of bad keys and old references.
/// </summary>
public sealed class JointDistanceCheckTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-joint-distance-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private const string FixtureContract = """
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
          sliced-ks-max: { worst: 0.2, mean: 0.1 }
          sliced-wasserstein-max: { worst: 0.3, mean: 0.2 }
        """;

    /// <summary>The fixed data set of tests/fixtures/joint in the work folder, its contract reading <paramref name="sample"/>, and the reference built.</summary>
    private string FixtureSetup(string sample) => JointTestData.FixedDataSet(_dir, FixtureContract.Replace("SAMPLE", sample));

    /// <summary>Each joint check's JUnit properties, by check key.</summary>
    private static Dictionary<string, Dictionary<string, string>> JointCases(string junit) => JointTestData.Cases(junit, "joint(a,b,c)");

    private static double Number(string s) => double.Parse(s, CultureInfo.InvariantCulture);

    private static void Close(double expected, double actual, double relative, string what) =>
        Assert.True(Math.Abs(actual - expected) <= relative * Math.Abs(expected), $"{what}: {actual:R} against {expected:R} (relative {relative})");

    [Fact]
    public void The_distances_on_a_fixed_data_set_agree_with_numpy_and_scipy()
    {
        var contractPath = FixtureSetup("sample.csv");
        var junit = Path.Combine(_dir, "gate.xml");
        var markdown = Path.Combine(_dir, "gate.md");
        var html = Path.Combine(_dir, "gate.html");
        // --all-checks: the console lists every check (the compact default shows only the binding ones and the failures).
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--all-checks", "--junit", junit, "--markdown", markdown, "--html", html);
        // Both within their tolerances: the run passes (docs/cli.md, exit 0).
        Assert.True(code == 0, stdout + stderr);
        Assert.Contains("PASSED", stdout);
        var cases = JointCases(junit);
        var fixture = JsonNode.Parse(File.ReadAllText(Path.Combine(RepositoryRoot.Path, "tests", "fixtures", "scipy", "joint_distance.json")))!;
        var frechet = cases["frechet-max"];
        var kernel = cases["kernel-distance-max"];
        // tests/fixtures/scipy/joint_distance.json, made by make_joint_distance_fixtures.py with numpy 1.24.2 and scipy
        // 1.10.1: the 1/N-extrapolated Fréchet distance (scipy.linalg.sqrtm on each window's fits, numpy.polyfit), its
        // delete-one-block jackknife, and the plain distance on all events.
        Close(Number(fixture["frechet"]!["extrapolated"]!.ToString()), Number(frechet["estimate"]), 1e-9, "Fréchet distance");
        Close(Number(fixture["frechet"]!["standard_error"]!.ToString()), Number(frechet["standard_error"]), 1e-9, "its standard error");
        Close(Number(fixture["frechet"]!["all_events"]!.ToString()), Number(frechet["all_events"]), 1e-9, "Fréchet distance on all events");
        // The same fixture: MMD²ᵤ with the cubic kernel from the kernel matrices of every pair of rows (numpy matrix
        // products), and the standard error of its 16 block estimates (numpy.std(ddof=1)/4). The estimate is a
        // difference of terms about 100 times larger, so it keeps fewer digits than its terms.
        Close(Number(fixture["kernel"]!["estimate"]!.ToString()), Number(kernel["estimate"]), 1e-9, "kernel distance");
        Close(Number(fixture["kernel"]!["standard_error"]!.ToString()), Number(kernel["standard_error"]), 1e-9, "its standard error");
        Assert.Equal("6000", frechet["reference_rows"]);
        Assert.Equal("4000", kernel["sample_rows"]);

        // Every report lists them under the joint block, as other checks are listed under their subject.
        Assert.Contains("joint(a,b,c)", stdout);
        Assert.Matches(@"joint\(a,b,c\)\s+frechet-max", stdout);
        Assert.Matches(@"joint\(a,b,c\)\s+kernel-distance-max", stdout);
        var md = File.ReadAllText(markdown);
        Assert.Contains("frechet-max", md);
        Assert.Contains("kernel-distance-max", md);
        var page = File.ReadAllText(html);
        Assert.Contains("frechet-max", page);
        Assert.Contains("kernel-distance-max", page);
    }

    [Fact]
    public void An_inconclusive_joint_check_says_how_many_events_would_decide_it()
    {
        var contractPath = FixtureSetup("sample.csv");
        File.WriteAllText(contractPath, FixtureContract.Replace("SAMPLE", "sample.csv").Replace("kernel-distance-max: 0.2", "kernel-distance-max: 0.05"));
        var junit = Path.Combine(_dir, "gate.xml");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--junit", junit);
        // 0.0200 ± 0.0254: the upper bound 0.062 is above 0.05 and the estimate well below it, so neither pass nor fail
        // (docs/cli.md: UNDECIDED, exit 5, GATE3100 with the events needed).
        Assert.True(code == 5, stdout + stderr);
        Assert.Contains("error GATE3100", stderr);
        var kernel = JointCases(junit)["kernel-distance-max"];
        Assert.Equal("inconclusive", kernel["verdict"]);
        Assert.True(Number(kernel["events_needed"]) > 4000, kernel["events_needed"]);
        Assert.Equal("pass", JointCases(junit)["frechet-max"]["verdict"]);
    }

    [Fact]
    public void Fill_merge_and_check_from_partials_give_the_numbers_of_one_pass()
    {
        // The fixed sample cut into three files; one pass reads all three, the fan-out fills each apart.
        var contractPath = FixtureSetup("shard-*.csv");
        var lines = File.ReadAllLines(Path.Combine(_dir, "sample.csv"));
        int[] cuts = [1, 1501, 3001, lines.Length];
        for (var k = 0; k < 3; k++)
            File.WriteAllLines(Path.Combine(_dir, $"shard-{k}.csv"), lines.Take(1).Concat(lines[cuts[k]..cuts[k + 1]]));
        var whole = Path.Combine(_dir, "whole.xml");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--junit", whole);
        Assert.True(code is 0 or 1, stdout + stderr);
        for (var k = 0; k < 3; k++)
        {
            (code, stdout, stderr) = Cli.Run("fill", "--contract", contractPath, "--sample", Path.Combine(_dir, $"shard-{k}.csv"), "--output", Path.Combine(_dir, $"part-{k}.partial"));
            Assert.True(code == 0, stdout + stderr);
        }
        (code, stdout, stderr) = Cli.Run("merge", "--contract", contractPath, "--output", Path.Combine(_dir, "ab.partial"), Path.Combine(_dir, "part-2.partial"), Path.Combine(_dir, "part-0.partial"));
        Assert.True(code == 0, stdout + stderr);
        var fanned = Path.Combine(_dir, "fanned.xml");
        (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--partials", Path.Combine(_dir, "part-1.partial"), Path.Combine(_dir, "ab.partial"), "--junit", fanned);
        Assert.True(code is 0 or 1, stdout + stderr);

        // The program compared with itself: the streamed moments and kernel sums are merged by the pairwise update and
        // by addition, so the numbers agree with one pass to rounding (docs/shards.md), and the verdicts are the same.
        var a = JointCases(whole);
        var b = JointCases(fanned);
        string[] sliced = ["sliced-ks-max[mean]", "sliced-ks-max[worst]", "sliced-wasserstein-max[mean]", "sliced-wasserstein-max[worst]"];
        Assert.Equal(["frechet-max", "kernel-distance-max", .. sliced], a.Keys.Order(StringComparer.Ordinal));
        // The sliced histograms are exact sums (hi + lo terms in the partials), so every sliced number — estimate,
        // bootstrap errors, floor, bounds — is the same to the last bit as one pass's (docs/shards.md).
        foreach (var key in sliced)
        {
            Assert.Equal(a[key]["verdict"], b[key]["verdict"]);
            foreach (var number in new[] { "estimate", "estimate_uncorrected", "bootstrap_bias", "standard_error", "floor", "lower_bound", "upper_bound", "worst_projection", "sample_rows" })
                Assert.True(a[key][number] == b[key][number], $"{key} {number}: one pass {a[key][number]}, shards {b[key][number]}");
        }
        foreach (var key in new[] { "frechet-max", "kernel-distance-max" })
        {
            Assert.Equal(a[key]["verdict"], b[key]["verdict"]);
            foreach (var number in new[] { "estimate", "standard_error", "upper_bound" })
                Close(Number(a[key][number]), Number(b[key][number]), 1e-12, $"{key} {number}");
            Assert.Equal(a[key]["sample_rows"], b[key]["sample_rows"]);
        }
        Assert.Equal("4000", b["frechet-max"]["sample_rows"]);
    }

    [PythonModulesFact("numpy")]
    public void A_surrogate_with_one_feature_permuted_fails_both_checks_at_100000_events_and_a_faithful_one_passes()
    {
        string Verdicts(string surrogate, out string output)
        {
            var (contractPath, drawn) = JointTestData.Drawn(_dir, surrogate, 100_000, 3, "  frechet-max: 0.02\n  kernel-distance-max: 0.01\n");
            var folder = Path.GetDirectoryName(contractPath)!;
            var junit = Path.Combine(folder, "gate.xml");
            var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--junit", junit);
            output = drawn + stdout + stderr;
            return string.Join(",", JointTestData.Cases(junit, "joint(x,y,u)").Select(c => c.Key + "=" + c.Value["verdict"]));
        }

        // Pearson(x, y) ≈ 0.47 (y = exp((0.5 x + √0.75 z)/2)), and 0 once y is permuted across events: for standardised
        // Gaussian features a correlation ρ lost moves the Fréchet distance by 2 + 2 − 2·(√(1+ρ) + √(1−ρ)), 0.13 at ρ = 0.5,
        // and the cubic kernel's mean embedding by 3·2/d²·ρ² = 0.17 at d = 3 (its x·y monomial alone), far above
        // tolerances of 0.02 and 0.01; every marginal is the same, so only the joint checks can see it.
        Assert.Equal("frechet-max=fail,kernel-distance-max=fail", Verdicts("permuted", out var permuted));
        Assert.Contains("error GATE3022", permuted);
        Assert.Contains("error GATE3023", permuted);
        // A second draw of the same law, 100 000 events a side: both distances are estimated well within the tolerances.
        Assert.Equal("frechet-max=pass,kernel-distance-max=pass", Verdicts("faithful", out var faithful));
        Assert.Contains("PASSED", faithful);
    }

    [Fact]
    public void Bad_tolerances_are_refused_at_their_line_and_column()
    {
        var contractPath = FixtureSetup("sample.csv");
        File.WriteAllText(contractPath, FixtureContract.Replace("SAMPLE", "sample.csv").Replace("frechet-max: 0.05", "frechet-max: -1"));
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath);
        // docs/error-codes.md: GATE1004, a bad value, at its place in the contract.
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("precision-contract.yaml(13,16): error GATE1004: joint.frechet-max must be positive, got -1.", stderr);
        Assert.DoesNotContain("   at ", stdout + stderr);

        File.WriteAllText(contractPath, FixtureContract.Replace("SAMPLE", "sample.csv").Replace("kernel-distance-max: 0.2", "kernel-distance-max: lots"));
        (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath);
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("precision-contract.yaml(14,24): error GATE1004: joint.kernel-distance-max must be a finite number, got 'lots'.", stderr);
    }

    [Fact]
    public void A_reference_without_the_kernel_sums_a_check_reads_is_refused_with_the_command_that_rebuilds_it()
    {
        var contractPath = FixtureSetup("sample.csv");
        // Built for the Fréchet distance alone, checked with the kernel distance too.
        File.WriteAllText(contractPath, FixtureContract.Replace("SAMPLE", "sample.csv").Replace("\n  kernel-distance-max: 0.2", ""));
        Assert.Equal(0, Cli.Run("reference", "build", "--contract", contractPath, "--from", Path.Combine(_dir, "reference.csv")).ExitCode);
        File.WriteAllText(contractPath, FixtureContract.Replace("SAMPLE", "sample.csv"));
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath);
        // docs/error-codes.md: GATE2103, a reference built for another contract, rebuilt.
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("error GATE2103", stderr);
        Assert.Contains("no kernel sums of joint(a,b,c), which its kernel-distance-max check reads", stderr);
        Assert.Contains("rebuild it with 'gatetasks reference build'", stderr);
    }

    [Fact]
    public void A_version_6_partial_is_refused_and_must_be_filled_again()
    {
        var contractPath = FixtureSetup("sample.csv");
        var partial = Path.Combine(_dir, "sample.partial");
        var (code, stdout, stderr) = Cli.Run("fill", "--contract", contractPath, "--sample", Path.Combine(_dir, "sample.csv"), "--output", partial);
        Assert.True(code == 0, stdout + stderr);
        // A partial as version 6 wrote it: no streamed joint state.
        var json = JsonNode.Parse(File.ReadAllText(partial))!.AsObject();
        Assert.NotNull(json["content"]!["accumulation"]!["joint_moments"]);
        json["version"] = 6;
        json["content"]!["accumulation"]!.AsObject().Remove("joint_moments");
        json["content"]!["accumulation"]!.AsObject().Remove("joint_sliced");
        File.WriteAllText(partial, json.ToJsonString());
        (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--partials", partial);
        // docs/error-codes.md: GATE2201, a partial of another version, filled again.
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("error GATE2201", stderr);
        Assert.Contains("Partial file version 6", stderr);
        Assert.Contains("the joint block's streamed moments and kernel sums", stderr);
        Assert.Contains("fill it again", stderr);
    }

    [Fact]
    public async Task A_format_5_reference_is_refused_with_the_command_that_rebuilds_it()
    {
        var contractPath = FixtureSetup("sample.csv");
        // The reference as format 5 wrote it: the same cells, a header without the joint block's streamed state.
        var referencePath = Path.Combine(_dir, "reference.parquet");
        await OlderReferenceFile.RewriteAsync(referencePath, 5, header =>
        {
            header.Remove("joint_moments");
            header.Remove("joint_sliced");
        });
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath);
        // docs/error-codes.md: GATE2102, an unsupported format version, with the way out (rebuild).
        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("error GATE2102", stdout + stderr);
        Assert.Contains("reference format 5", stdout + stderr);
        Assert.Contains("no streamed moments or kernel sums of its joint block", stdout + stderr);
        Assert.Contains("rebuild it with 'gatetasks reference build' (format 8)", stdout + stderr);
        Assert.DoesNotContain("   at ", stdout + stderr);
    }
}
