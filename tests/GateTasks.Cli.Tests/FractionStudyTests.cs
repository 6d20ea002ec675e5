using System.Globalization;
using System.Text.RegularExpressions;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// Fixed-seed versions of tests/studies/fraction_study.py (DEVELOPERS.md gives the full one): numpy draws a multiplicity
/// n_jets (Poisson(2.2) capped at 12, sparse categories included) and a continuous feature, the reference is built
/// with `gatetasks reference build` and the surrogate checked with `gatetasks check`, each in a process of its own.
/// </summary>
public sealed class FractionStudyTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-fraction-study-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private (int Exit, string Stdout, string Stderr, int FractionFailed, int Failing) Study(params string[] options)
    {
        var script = Path.Combine(RepositoryRoot.Path, "tests", "studies", "fraction_study.py");
        var cli = "dotnet " + typeof(GateTasks.Cli.CliApp).Assembly.Location;
        var (exit, stdout, stderr) = ProcessRunner.Run(ExternalPython.Interpreter, [script, "--cli", cli, "--work", _dir, .. options], _dir, null, 900);
        var fraction = Regex.Match(stdout, @"fraction-max failed (\d+) ");
        var failing = Regex.Match(stdout, @"failing replicas (\d+) ");
        Assert.True(fraction.Success && failing.Success, $"exit {exit}\n{stdout}\n{stderr}");
        return (exit, stdout, stderr, int.Parse(fraction.Groups[1].Value, CultureInfo.InvariantCulture), int.Parse(failing.Groups[1].Value, CultureInfo.InvariantCulture));
    }

    [PythonModulesFact("numpy", "scipy")]
    public void Fifteen_percent_of_events_moved_from_two_jets_to_three_fail_at_two_thousand_events()
    {
        var r = Study("--replicas", "3", "--shift", "0.15", "--tolerance", "0.1", "--sample-events", "2000", "--reference-events", "40000", "--seed", "3");
        // The shift is 0.15 against a tolerance of 0.1: the effect is outside tolerance, so every replica must fail
        // (at 2 000 events the estimate's σ is about 0.01, five of them below the excess).
        Assert.True(r.FractionFailed == 3, $"{r.FractionFailed} of 3 shifted replicas failed fraction-max\n{r.Stdout}\n{r.Stderr}");
    }

    [PythonModulesFact("numpy", "scipy")]
    public void A_faithful_weighted_multiplicity_fails_at_most_the_stated_rate()
    {
        var r = Study("--replicas", "20", "--weighted", "--tolerance", "0.005", "--sample-events", "10000", "--reference-events", "20000", "--seed", "17");
        // Family-wise false-alarm 0.01 per replica (Holm over its checks): failing replicas are at most
        // Binomial(20, 0.01); P(X ≥ 2) = 0.0169 (scipy 1.10.1: scipy.stats.binom.sf(1, 20, 0.01)), so at most 1 is allowed.
        Assert.True(r.Failing <= 1, $"{r.Failing} of 20 faithful replicas failed\n{r.Stdout}\n{r.Stderr}");
    }
}
