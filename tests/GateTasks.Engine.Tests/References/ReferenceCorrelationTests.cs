using System.Globalization;
using System.Text.Json;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.References;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.References;

/// <summary>
/// Pearson's r and Spearman's ρ as the gate streams them, against tests/fixtures/scipy/correlation.json, written by
/// tests/fixtures/scipy/make_correlation_fixtures.py with Debian's python3-scipy 1.10.1 / numpy 1.24.2
/// (scipy.stats.pearsonr and scipy.stats.spearmanr; each case records its call and its inputs).
/// </summary>
public sealed class ReferenceCorrelationTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gate-corr-").FullName;

    public void Dispose() => Directory.Delete(_dir, true);

    private static readonly Lazy<JsonDocument> Fixture = new(() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "scipy", "correlation.json"))));

    public static TheoryData<string> Cases() => new(Fixture.Value.RootElement.GetProperty("correlation").EnumerateArray()
        .Select(c => c.GetProperty("name").GetString()!));

    [Fact]
    public void The_fixture_records_the_scipy_version()
    {
        Assert.Equal("1.10.1", Fixture.Value.RootElement.GetProperty("scipy").GetString());
        Assert.Equal("1.24.2", Fixture.Value.RootElement.GetProperty("numpy").GetString());
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Streamed_coefficients_match_scipy(string name)
    {
        var c = Fixture.Value.RootElement.GetProperty("correlation").EnumerateArray().First(e => e.GetProperty("name").GetString() == name);
        var x = c.GetProperty("x").EnumerateArray().Select(v => v.GetDouble()).ToArray();
        var y = c.GetProperty("y").EnumerateArray().Select(v => v.GetDouble()).ToArray();
        File.WriteAllLines(Path.Combine(_dir, "data.csv"), new[] { "x,y" }.Concat(x.Select((v, i) =>
            string.Create(CultureInfo.InvariantCulture, $"{v:R},{y[i]:R}"))));
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, """
            contract-version: 1
            sample: data.csv
            reference: ref.parquet
            defaults:
              binning: { bins: 400 }
              checks: { ks-max: 0.05 }
            features:
              - name: x
              - name: y
            correlations:
              - features: [x, y]
                pearson-max: 0.01
                spearman-max: 0.01
            """);
        var contract = ContractLoader.Load(contractPath);
        var reference = ReferenceBuilder.Build(contract, [Path.Combine(_dir, "data.csv")], null, "test");
        var pair = reference.FindPair("x", "y")!;
        // Pearson's r is streamed exactly (West 1979 updates): agreement to rounding.
        Assert.Equal(c.GetProperty("pearson").GetDouble(), pair.Pearson, 12);
        // Spearman's ρ uses ranks under the reference's binned marginal CDF (linear within each of 400 equal-probability
        // bins), not the exact ranks: agreement to 2e-4 (4e-5 seen), a bound of this approximation set by us, not a published one.
        Assert.InRange(pair.Spearman - c.GetProperty("spearman").GetDouble(), -2e-4, 2e-4);

        // The sample side streams the same way: the same data as sample gives no difference at all.
        ReferenceFile.Write(contract.ReferenceFullPath, reference);
        var report = ContractRun.Run(contract);
        Assert.All(report.Outcomes.Where(o => o.Check.Kind is CheckKind.PearsonDifference or CheckKind.SpearmanDifference),
            o => Assert.Equal(0, o.Measured.Estimate, 12));
    }
}
