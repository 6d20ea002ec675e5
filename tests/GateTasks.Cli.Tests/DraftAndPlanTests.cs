using System.Text.RegularExpressions;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;

namespace GateTasks.Cli.Tests;

/// <summary>
/// From "we expect 300 data events" to a checked surrogate, on the demo scenario, as the README's worked example
/// runs it: draft a contract from the full simulation, build its reference, plan the sample size, and check a
/// faithful demo surrogate, at least the planned size (it must pass), and the drifted demo surrogate (it must fail).
/// </summary>
public sealed class DraftAndPlanTests(DemoFixture demo) : IClassFixture<DemoFixture>, IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-draft-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    [Fact]
    public void A_drafted_contract_loads_passes_a_faithful_sample_of_the_planned_size_and_fails_the_drifted_one()
    {
        Assert.Equal(0, demo.ExitCode);
        var fullsim = Path.Combine(demo.Folder, "fullsim.parquet");
        var contract = Path.Combine(_dir, "precision-contract.yaml");

        var (code, stdout, stderr) = Cli.Run("draft", "--from", fullsim, "--data-events", "300", "--weight", "weight",
            "--sample-path", "surrogate.parquet", "--output", contract);
        Assert.True(code == 0, stdout + stderr);
        var loaded = ContractLoader.Load(contract);
        Assert.Equal(FeatureKind.Discrete, loaded.Features.Single(f => f.Name == DemoColumns.JetCount).Kind);
        Assert.Equal(0, loaded.Features.Single(f => f.Name == DemoColumns.LeadJetPt).Spike); // no jet: pT exactly 0
        // docs/contract.md: a draft holds effect checks only, no goodness-of-fit test (a diagnostic, which decides nothing).
        Assert.All(loaded.Features, f => Assert.All(f.Checks, c => Assert.IsNotType<GoodnessOfFitTest>(c)));
        Assert.DoesNotContain(loaded.Pairs, p => p.Chi2 is not null);
        Assert.Null(loaded.Joint);

        // A second draft never replaces the first unless told to.
        (code, _, stderr) = Cli.Run("draft", "--from", fullsim, "--data-events", "300", "--output", contract);
        Assert.Equal(2, code);
        Assert.Contains("--force", stderr);

        (code, stdout, stderr) = Cli.Run("reference", "build", "--contract", contract, "--from", fullsim);
        Assert.True(code == 0, stdout + stderr);

        (code, stdout, stderr) = Cli.Run("plan", "--contract", contract, "--replicas", "100", "--markdown", Path.Combine(_dir, "plan.md"));
        Assert.True(code == 0, stdout + stderr);
        var planned = Regex.Match(stdout, @"passes every check with probability ≥ 0\.95 from ≈(\d+) events");
        Assert.True(planned.Success, stdout);
        var events = long.Parse(planned.Groups[1].Value);

        // The demo's faithful surrogate is at least the planned size, and passes.
        Assert.InRange(events, 10_000, DemoRun.SurrogateEvents);
        (code, stdout, stderr) = Cli.Run("check", "--contract", contract, "--sample", Path.Combine(demo.Folder, "surrogate-faithful.parquet"));
        Assert.True(code == 0, $"the faithful surrogate ({DemoRun.SurrogateEvents} events, {events} planned) did not pass:\n{stdout}{stderr}");

        (code, stdout, stderr) = Cli.Run("check", "--contract", contract, "--sample", Path.Combine(demo.Folder, "surrogate-drifted.parquet"));
        Assert.True(code == 1, stdout + stderr);
        Assert.Contains("error GATE30", stderr);
    }
}
