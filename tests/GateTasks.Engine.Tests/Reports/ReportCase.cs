using System.Globalization;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.References;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Reports;

/// <summary>
/// A small check run for the report tests: a continuous feature with a named region, a second continuous feature,
/// a discrete one and a correlated pair, checked on CSV samples drawn with MathNet's seeded generator.
/// </summary>
public sealed class ReportCase : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-report-").FullName;

    public const string ContractText = """
        contract-version: 1
        title: report-case
        sample: surrogate.csv
        reference: ref.parquet
        defaults:
          binning: { bins: 12 }
          checks:
            ks-max: 0.03
            ratio-max: { core: 0.15, tails: 0.3 }
        features:
          - name: x
            regions:
              upper: [1, 4]
            checks:
              ratio-max: { upper: 0.2 }
          - name: y
          - name: k
            kind: discrete
        correlations:
          - features: [x, y]
            pearson-max: 0.05
        """;

    public ReportCase()
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, ContractText);
        Contract = ContractLoader.Load(contractPath);
        var fullsim = Write("fullsim.csv", 40_000, 1, 0);
        ReferenceFile.Write(Contract.ReferenceFullPath, ReferenceBuilder.Build(Contract, [fullsim], null, "test"));
    }

    internal PrecisionContract Contract { get; }

    public string Folder => _dir;

    /// <summary>Checks a sample of <paramref name="rows"/> events whose x is shifted by <paramref name="shift"/> (in σ).</summary>
    internal RunResult Run(int rows, int seed, double shift) =>
        ContractRun.Run(Contract, Write($"sample-{seed}-{shift.ToString(CultureInfo.InvariantCulture)}.csv", rows, seed, shift));

    private string Write(string name, int rows, int seed, double shift)
    {
        var random = new Xoshiro256StarStar(seed);
        var normal = new Normal(0, 1, random);
        var path = Path.Combine(_dir, name);
        var lines = new List<string> { "x,y,k" };
        for (var i = 0; i < rows; i++)
        {
            var x = normal.Sample();
            var y = 0.5 * x + normal.Sample();
            // Categories of unequal share, so the 90% core holds three and the tails one.
            var u = random.NextDouble();
            var k = u < 0.5 ? 0 : u < 0.8 ? 1 : u < 0.95 ? 2 : 3;
            lines.Add(string.Create(CultureInfo.InvariantCulture, $"{x + shift:R},{y:R},{k}"));
        }
        File.WriteAllLines(path, lines);
        return path;
    }

    public void Dispose() => Directory.Delete(_dir, recursive: true);
}
