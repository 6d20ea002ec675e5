using System.Globalization;
using System.Text.RegularExpressions;
using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// The fixed-seed version of tests/studies/joint_power_study.py (DEVELOPERS.md): numpy draws a reference and
/// surrogates of a law with a correlated, skewed pair beside three independent features; the real gatetasks program
/// checks them under a contract whose joint block holds frechet-max and kernel-distance-max. At reduced sizes (a
/// reference of 10⁵ events, surrogates of 2·10⁴) a surrogate with one pair member permuted across events must fail
/// the joint block every time, and a faithful one must not fail it, unweighted and with negative weights.
/// </summary>
public sealed class JointPowerStudyTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-joint-power-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    [PythonModulesFact("numpy", "scipy")]
    public void A_permuted_pair_fails_the_joint_block_and_a_faithful_surrogate_does_not()
    {
        var cli = "dotnet " + typeof(GateTasks.Cli.CliApp).Assembly.Location;
        var (exit, stdout, stderr) = ProcessRunner.Run(ExternalPython.Interpreter,
            [
                Path.Combine(RepositoryRoot.Path, "tests", "studies", "joint_power_study.py"), "--cli", cli,
                "--modes", "permuted:20000,null:20000", "--replicas", "3,4", "--reference-events", "100000",
                "--weighting", "unweighted,weighted", "--seed", "3", "--work", Path.Combine(_dir, "work"),
            ], _dir, null, 900);
        Assert.True(exit == 0, $"exit {exit}\n{stdout}\n{stderr}");
        var rows = Regex.Matches(stdout, @"^summary weighting=(\w+) mode=(\w+) events=\d+ replicas=(\d+) fails=(\d+)", RegexOptions.Multiline)
            .GroupBy(m => (m.Groups[1].Value, m.Groups[2].Value)) // each summary line is printed twice: as it comes, and at the end
            .Select(g => g.First())
            .ToDictionary(m => (m.Groups[1].Value, m.Groups[2].Value),
                m => (Replicas: int.Parse(m.Groups[3].Value, CultureInfo.InvariantCulture), Fails: int.Parse(m.Groups[4].Value, CultureInfo.InvariantCulture)));
        Assert.Equal(4, rows.Count);
        foreach (var weighting in new[] { "unweighted", "weighted" })
        {
            // The permuted pair's Fréchet distance is 0.136 (scipy.linalg.sqrtm of the unit-variance bivariate normals
            // with correlation 0.5 and 0, scipy 1.10.1), 170 times the tolerance 0.0008 and about 30 of its standard
            // errors at 2·10⁴ events: every replica must fail.
            Assert.True(rows[(weighting, "permuted")] == (3, 3), $"{weighting}\n{stdout}");
            // The faithful surrogate fails only by a false alarm, at most 1% per replica (the contract's false-alarm,
            // Holm): P(any of 4 fails) ≤ 0.039 (1 − 0.99⁴), so with this seed none of the 4 may fail.
            Assert.True(rows[(weighting, "null")] == (4, 0), $"{weighting}\n{stdout}");
        }
    }
}
