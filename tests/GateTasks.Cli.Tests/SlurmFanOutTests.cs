using System.Numerics;
using System.Text.Json.Nodes;
using System.Text.RegularExpressions;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>Slurm tests start daemons of their own; they run alone, never beside each other or other tests.</summary>
[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class SlurmCollection
{
    public const string Name = "single-node Slurm";
}

/// <summary>
/// docs/shards.md's Slurm fan-out, run as the page writes it — its fill.sh and submit.sh are taken from the page — on
/// a single-node Slurm 22.05 the test starts itself (<see cref="SingleNodeSlurm"/>): a job array of `gatetasks fill`
/// over four shards of the demo sample, one `merge` and one `check --partials` as dependent jobs, `sbatch --wait` on
/// the last. The expectation is one `check` (and one `fill`) over the same four files: the program compared with
/// itself, across processes, jobs and a batch system. Slurm behaviour relied on (array indices in
/// SLURM_ARRAY_TASK_ID, afterok dependencies, sbatch --wait returning the job's exit code, default output files
/// slurm-%A_%a.out in the submission folder) is from the Slurm 22.05 manual pages Debian installs (man sbatch).
/// </summary>
[Collection(SlurmCollection.Name)]
public sealed partial class SlurmFanOutTests : IDisposable
{
    private const int Shards = 4;
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-slurm-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
    }

    [SlurmFact]
    public void The_job_array_merge_and_check_of_docs_shards_decide_as_one_pass_does()
    {
        if (!OperatingSystem.IsLinux()) throw new PlatformNotSupportedException("a single-node Slurm needs Linux");
        var (fillScript, submitScript) = JobScripts();
        var work = Directory.CreateDirectory(Path.Combine(_dir, "work")).FullName;
        File.WriteAllText(Path.Combine(work, "fill.sh"), fillScript);
        File.WriteAllText(Path.Combine(work, "submit.sh"), submitScript);

        // The demo's contract over shards/part-000.parquet …, a reference from a full-simulation sample kept elsewhere,
        // and four shards of a drifted surrogate, so that some checks fail and the verdict is not a trivial pass.
        var contractPath = Path.Combine(work, "precision-contract.yaml");
        File.WriteAllText(contractPath, DemoContract.Text.Replace("path: surrogate-faithful.parquet", "path: shards/part-*.parquet"));
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 200_000, 11, 50_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));
        Directory.CreateDirectory(Path.Combine(work, "shards"));
        for (var k = 0; k < Shards; k++)
            DemoSampleWriter.Write(Path.Combine(work, "shards", $"part-{k:000}.parquet"), DemoScenarioParameters.Drifted, 30_000, 200 + k, 10_000);

        // One pass over the four files: the check's report, and one partial filled from all of them.
        var onePass = Path.Combine(_dir, "one-pass.junit.xml");
        var (onePassExit, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--junit", onePass);
        Assert.True(onePassExit == 1, stdout + stderr); // the drifted sample fails some checks
        var onePassPartial = Path.Combine(_dir, "one-pass.partial");
        (var code, stdout, stderr) = Cli.Run("fill", "--contract", contractPath, "--sample", Path.Combine(work, "shards", "part-*.parquet"), "--output", onePassPartial);
        Assert.True(code == 0, stdout + stderr);

        // A `gatetasks` on PATH for the jobs (sbatch passes the submitting environment on): the built program.
        var bin = Directory.CreateDirectory(Path.Combine(_dir, "bin")).FullName;
        var shim = Path.Combine(bin, "gatetasks");
        File.WriteAllText(shim, $"#!/bin/sh\nexec dotnet '{typeof(CliApp).Assembly.Location}' \"$@\"\n");
        File.SetUnixFileMode(shim, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute | UnixFileMode.GroupRead | UnixFileMode.GroupExecute | UnixFileMode.OtherRead | UnixFileMode.OtherExecute);

        using var slurm = SingleNodeSlurm.Start(Path.Combine(_dir, "slurm"), TimeSpan.FromSeconds(60));
        var environment = new Dictionary<string, string>(slurm.Environment) { ["PATH"] = bin + Path.PathSeparator + Environment.GetEnvironmentVariable("PATH") };
        (int ExitCode, string Stdout, string Stderr) submit;
        try
        {
            submit = ProcessRunner.Run("bash", ["submit.sh"], work, environment, timeoutSeconds: 120);
        }
        catch (TimeoutException e)
        {
            throw new TimeoutException($"{e.Message}\n{JobOutputs(work)}\n{slurm.Logs()}", e);
        }
        string Story() => $"submit.sh exit {submit.ExitCode}\n{submit.Stdout}{submit.Stderr}\n{JobOutputs(work)}\n{slurm.Logs()}";

        // submit.sh ends with `sbatch --wait` on the check, so its exit code is the check's: 1, as in one pass.
        Assert.True(submit.ExitCode == onePassExit, Story());
        // It ran as an array of four tasks (one output file and one partial per task), then merged and decided.
        var tasks = Directory.GetFiles(work, "slurm-*.out").Select(f => ArrayTaskOutput().Match(Path.GetFileName(f))).Where(m => m.Success).ToList();
        Assert.True(tasks.Select(m => m.Groups[1].Value).Distinct().Count() == 1, Story());
        Assert.True(tasks.Select(m => int.Parse(m.Groups[2].Value)).Order().SequenceEqual(Enumerable.Range(0, Shards)), Story());
        Assert.All(Enumerable.Range(0, Shards), k => Assert.True(File.Exists(Path.Combine(work, "partials", $"part-{k:000}.partial")), Story()));
        Assert.True(File.Exists(Path.Combine(work, "gate.md")), Story());

        // The same checks and verdicts, and the same estimate for every binned check, as one pass.
        var compared = JunitCheckCases.AssertSameAsOnePass(onePass, Path.Combine(work, "gate.junit.xml"));
        Assert.True(compared > 0);
        // The histogram cells (Σw and Σw² of every bin) of the merged partial: the same as one fill over the four files.
        var merged = Histograms(Path.Combine(work, "merged.partial"));
        var whole = Histograms(onePassPartial);
        Assert.Equal(whole.Count, merged.Count);
        Assert.NotEmpty(whole);
        for (var f = 0; f < whole.Count; f++) Assert.True(whole[f] == merged[f], $"feature {f}: histogram cells differ");
    }

    /// <summary>docs/shards.md's two scripts under "A job array": fill.sh (the array's task), then submit.sh.</summary>
    private static (string Fill, string Submit) JobScripts()
    {
        var page = File.ReadAllText(Path.Combine(RepositoryRoot.Path, "docs", "shards.md"));
        var start = page.IndexOf("## A job array", StringComparison.Ordinal);
        Assert.True(start >= 0, "docs/shards.md has no section \"A job array\"");
        var end = page.IndexOf("\n## ", start + 1, StringComparison.Ordinal);
        var blocks = ShellBlock().Matches(page[start..(end < 0 ? page.Length : end)]).Select(m => m.Groups[1].Value).ToList();
        Assert.Equal(2, blocks.Count);
        Assert.Contains("#SBATCH", blocks[0]);
        Assert.Contains("fill.sh", blocks[1]);
        return (blocks[0], blocks[1]);
    }

    /// <summary>
    /// Every feature's histogram (entries, and the Σw and Σw² of every bin, flows and NaN included) with each exact sum
    /// written as the value it stands for. A partial keeps an exact sum as a list of doubles whose total is the sum
    /// (docs/shards.md, Shewchuk 1997); two equal sums may be split into different lists, so the lists are totalled
    /// exactly (in units of 2⁻¹⁰⁷⁴, the smallest double) before they are compared.
    /// </summary>
    private static List<string> Histograms(string partial)
    {
        var root = JsonNode.Parse(File.ReadAllText(partial))!.AsObject();
        var accumulation = (root["content"]?["accumulation"] ?? root["accumulation"])!.AsObject();
        return accumulation["features"]!.AsArray().Select(f => ExactText(f!["histogram"]!)).ToList();
    }

    private static string ExactText(JsonNode node) => node switch
    {
        JsonObject o => "{" + string.Join(",", o.OrderBy(p => p.Key, StringComparer.Ordinal).Select(p => p.Key + ":" + ExactText(p.Value!))) + "}",
        JsonArray a when a.All(e => e is JsonValue) => ExactTotal(a.Select(e => e!.GetValue<double>())).ToString(System.Globalization.CultureInfo.InvariantCulture),
        JsonArray a => "[" + string.Join(",", a.Select(e => ExactText(e!))) + "]",
        _ => node.ToJsonString(),
    };

    /// <summary>The exact total of finite doubles, as an integer multiple of 2⁻¹⁰⁷⁴ (IEEE 754 binary64 layout).</summary>
    private static BigInteger ExactTotal(IEnumerable<double> terms)
    {
        var total = BigInteger.Zero;
        foreach (var d in terms)
        {
            Assert.True(double.IsFinite(d), $"not a finite sum term: {d}");
            var bits = BitConverter.DoubleToInt64Bits(d);
            var exponent = (int)((bits >> 52) & 0x7FF);
            var mantissa = bits & ((1L << 52) - 1);
            // Subnormal: mantissa × 2⁻¹⁰⁷⁴; normal: (2⁵² + mantissa) × 2^(exponent − 1075), that is × 2^(exponent − 1) units.
            var units = exponent == 0 ? new BigInteger(mantissa) : new BigInteger(mantissa | (1L << 52)) << (exponent - 1);
            total += bits < 0 ? -units : units;
        }
        return total;
    }

    private static string JobOutputs(string work) => string.Join('\n', Directory.GetFiles(work, "slurm-*.out").Order()
        .Select(f => $"--- {Path.GetFileName(f)}\n{File.ReadAllText(f).Trim()}"));

    [GeneratedRegex(@"```sh\n(.*?)```", RegexOptions.Singleline)]
    private static partial Regex ShellBlock();

    // sbatch's default output file for an array task: slurm-%A_%a.out (array job id, task index).
    [GeneratedRegex(@"^slurm-(\d+)_(\d+)\.out$")]
    private static partial Regex ArrayTaskOutput();
}
