using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;

namespace GateTasks.Cli.Tests;

/// <summary>Fan-out through the command line: fill four shards, merge them in two steps, decide from the partials.</summary>
public sealed class ShardCommandTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "gatetasks-shards-cli-" + Guid.NewGuid().ToString("N")[..8]);

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    [Fact]
    public void Fill_merge_and_check_from_partials_report_what_one_pass_reports()
    {
        Directory.CreateDirectory(_dir);
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, DemoContract.Text.Replace("path: surrogate-faithful.parquet", "path: shard-*.parquet"));
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 200_000, 11, 50_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));
        for (var k = 0; k < 4; k++)
            DemoSampleWriter.Write(Path.Combine(_dir, $"shard-{k}.parquet"), DemoScenarioParameters.Drifted, 30_000, 200 + k, 10_000);

        // One pass over all four shards.
        var whole = Path.Combine(_dir, "whole.xml");
        var (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--junit", whole);
        Assert.True(code == 1, stdout + stderr);

        // Fan out: one partial per shard (as one job of an array would), merged in two steps, then decided.
        for (var k = 0; k < 4; k++)
        {
            (code, stdout, stderr) = Cli.Run("fill", "--contract", contractPath, "--sample", Path.Combine(_dir, $"shard-{k}.parquet"), "--output", Path.Combine(_dir, $"part-{k}.partial"));
            Assert.True(code == 0, stdout + stderr);
            Assert.Matches(@"partial written: .*part-\d\.partial \(2\d{4} events\)", stdout); // the selection keeps most of 30 000
        }
        Assert.Equal(0, Cli.Run("merge", "--contract", contractPath, "--output", Path.Combine(_dir, "a.partial"), Path.Combine(_dir, "part-3.partial"), Path.Combine(_dir, "part-1.partial")).ExitCode);
        Assert.Equal(0, Cli.Run("merge", "--contract", contractPath, "--output", Path.Combine(_dir, "b.partial"), Path.Combine(_dir, "part-0.partial"), Path.Combine(_dir, "part-2.partial")).ExitCode);
        var fanned = Path.Combine(_dir, "fanned.xml");
        (code, stdout, stderr) = Cli.Run("check", "--contract", contractPath, "--partials", Path.Combine(_dir, "b.partial"), Path.Combine(_dir, "a.partial"), "--junit", fanned);
        Assert.True(code == 1, stdout + stderr);

        // Same checks, same verdicts, and the same numbers for everything but the unbinned moments, coefficients and joint test.
        JunitCheckCases.AssertSameAsOnePass(whole, fanned);

        // A shard counted twice is refused, naming the file.
        (code, _, stderr) = Cli.Run("check", "--contract", contractPath, "--partials", Path.Combine(_dir, "a.partial"), Path.Combine(_dir, "part-1.partial"));
        Assert.Equal(2, code);
        Assert.Contains("GATE2203", stderr);
        Assert.Contains("shard-1.parquet", stderr);
        // A file that is not a partial is refused as such.
        (code, _, stderr) = Cli.Run("check", "--contract", contractPath, "--partials", fullsim);
        Assert.Equal(2, code);
        Assert.Contains("GATE2201", stderr);
    }
}
