using System.Globalization;
using System.Text.RegularExpressions;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The fixed-seed version of tests/studies/power_study.py (DEVELOPERS.md): numpy draws a reference and surrogates from
/// laws whose effects are known in closed form (a scaled log-normal energy, a correlated response whose Pearson
/// coefficient is set analytically, a Poisson multiplicity with a share of events moved between two categories); the
/// real gatetasks program checks them under a contract of effect checks only. At 10⁵ events with every tolerance
/// scaled by √10 the effects sit where the full study's 10⁶-event effects sit in units of the noise.
/// </summary>
public sealed class PowerStudyTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-power-study-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    [PythonModulesFact("numpy", "scipy")]
    public void Effects_within_a_third_of_their_tolerance_pass_and_effects_at_twice_fail()
    {
        var (exit, stdout, stderr) = ProcessRunner.Run(ExternalPython.Interpreter,
            [
                Path.Combine(RepositoryRoot.Path, "tests", "studies", "power_study.py"),
                "--gatetasks", typeof(GateTasks.Cli.CliApp).Assembly.Location, "--events", "100000", "--reference-events", "200000",
                "--third", "6", "--twice", "2", "--seed", "5", "--work", Path.Combine(_dir, "work"),
            ], _dir, timeoutSeconds: 900);
        Assert.True(exit == 0, stdout + stderr);
        var rates = Regex.Matches(stdout, @"^summary scenario=(\w+) replicas=(\d+) hits=(\d+)", RegexOptions.Multiline)
            .GroupBy(m => m.Groups[1].Value)
            .ToDictionary(g => g.Key, g => (Replicas: int.Parse(g.First().Groups[2].Value, CultureInfo.InvariantCulture),
                Hits: int.Parse(g.First().Groups[3].Value, CultureInfo.InvariantCulture)));
        Assert.Equal(8, rates.Count);
        // Issue 17's bar: within a third of every tolerance passes in at least 95% of replicas, so with this seed all 6
        // pass (a 95% rate gives all 6 with probability 0.74; the full study's rate and interval are in DEVELOPERS.md).
        Assert.True(rates["third"] == (6, 6), stdout);
        // Twice the tolerance fails that check in at least 95% of replicas: both replicas of every kind.
        foreach (var kind in new[] { "mean", "width", "ks", "wasserstein", "quantile", "fraction", "pearson" })
            Assert.True(rates[kind] == (2, 2), $"{kind}\n{stdout}");
    }
}
