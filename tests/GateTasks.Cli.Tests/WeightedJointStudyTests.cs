using System.Globalization;
using System.Text.RegularExpressions;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// Fixed-seed versions of tests/studies/weighted_joint_study.py (DEVELOPERS.md gives the full one): numpy draws a
/// weighted reference (importance weights, some negative) and an unweighted surrogate of one correlated pair's law,
/// the reference is built with `gatetasks reference build` and the surrogate checked with `gatetasks check`, whose
/// contract's only test is the joint block's energy test.
/// </summary>
public sealed class WeightedJointStudyTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-joint-study-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private (int Failing, string Output) Study(params string[] options)
    {
        var script = Path.Combine(RepositoryRoot.Path, "tests", "studies", "weighted_joint_study.py");
        var cli = "dotnet " + typeof(GateTasks.Cli.CliApp).Assembly.Location;
        var (exit, stdout, stderr) = ProcessRunner.Run(ExternalPython.Interpreter,
            [script, "--cli", cli, "--work", _dir, "--reference-events", "5000", "--sample-events", "5000", "--subsample", "500", .. options], _dir, null, 900);
        var failing = Regex.Match(stdout, @"distinguishable replicas (\d+) ");
        Assert.True(exit == 0 && failing.Success, $"exit {exit}\n{stdout}\n{stderr}");
        return (int.Parse(failing.Groups[1].Value, CultureInfo.InvariantCulture), stdout + stderr);
    }

    [PythonModulesFact("numpy", "scipy")]
    public void A_weighted_reference_against_an_unweighted_faithful_surrogate_fails_at_most_the_stated_rate()
    {
        var (failing, output) = Study("--replicas", "6", "--seed", "5");
        // False-alarm 0.01 per replica: Binomial(6, 0.01) gives P(X ≥ 2) = 0.0015 (scipy 1.10.1:
        // scipy.stats.binom.sf(1, 6, 0.01)), so at most 1 of 6. The test that ignored the weights failed 6 of 6 here.
        Assert.True(failing <= 1, $"{failing} of 6 faithful replicas read distinguishable\n{output}");
    }

    [PythonModulesFact("numpy", "scipy")]
    public void A_surrogate_with_the_correlation_broken_is_still_caught()
    {
        var (failing, output) = Study("--replicas", "2", "--seed", "6", "--break-correlation");
        // Correlation 0.6 against none, 500 + 500 rows: the energy test (consistent against every difference of laws,
        // Székely & Rizzo 2004) reads it distinguishable in each replica.
        Assert.True(failing == 2, $"{failing} of 2 broken replicas read distinguishable\n{output}");
    }
}
