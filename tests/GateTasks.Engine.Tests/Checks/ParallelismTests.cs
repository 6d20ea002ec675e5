using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// Threads change the time of a check, never its content: the demo contract (every kind of check) with a joint block of
/// every kind (its visitors run beside the per-feature fills) on a sample whose
/// row groups are larger than one batch gives the same bits for every number with one, two or three threads.
/// These tests compare the program with itself (thread counts); they have no outside source.
/// </summary>
public sealed class ParallelismTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-threads-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    [Fact]
    public void One_two_and_three_threads_give_identical_reports()
    {
        var contractPath = Path.Combine(_dir, DemoContract.FileName);
        // With a joint block of every kind, whose visitors run beside the per-feature fills.
        File.WriteAllText(contractPath, DemoContract.Text.Replace("path: surrogate-faithful.parquet", "path: surrogate.parquet") + """

            joint:
              features: [m_gg, pt_gg, e_lead, e_sublead, eta_lead, cos_theta_star]
              frechet-max: 0.01
              kernel-distance-max: 0.001
              sliced-ks-max: { worst: 0.03, mean: 0.01 }
              sliced-wasserstein-max: { worst: 0.05, mean: 0.02 }
              projections: 8
            """);
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 200_000, 21, 50_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));
        // Row groups of 90 000 rows: each is handed on in two batches, the second one partial.
        DemoSampleWriter.Write(Path.Combine(_dir, "surrogate.parquet"), DemoScenarioParameters.Drifted, 200_000, 22, 90_000);

        var reports = new[] { 1, 2, 3 }.Select(t => ContractRun.Run(contract, parallelism: t)).ToList();

        var one = reports[0];
        Assert.Contains(one.Outcomes, o => o.Check.Label.StartsWith("frechet", StringComparison.Ordinal));
        Assert.Contains(one.Outcomes, o => o.Check.Label.StartsWith("sliced", StringComparison.Ordinal));
        Assert.True(one.Failures > 0); // the drifted sample: failures and passes both take part
        AssertSameNumbers(reports);
    }

    [Fact]
    public void Plain_float32_features_give_identical_reports_on_one_two_and_three_threads()
    {
        // No weight, selection, pairs or joint block: each plain float32 feature takes its values as its column is
        // decoded, and its buffer goes on to the next column a thread decodes. The e_lead column is also read by an
        // expression, so it keeps its own.
        var contractPath = Path.Combine(_dir, "plain-contract.yaml");
        File.WriteAllText(contractPath, """
            contract-version: 1
            title: plain-float32
            sample: { path: surrogate.parquet }
            reference: plain-reference.parquet
            decision: { confidence: 0.95, false-alarm: 0.01, correction: holm, inconclusive: warn }
            defaults:
              binning: { bins: 30, spacing: quantile }
              checks:
                ks-max: 0.05
                ks-test: on
                chi2-test: on
            features:
              - name: m_gg
              - name: pt_gg
              - name: e_lead
              - name: eta_lead
              - name: e_ratio
                expression: e_sublead / e_lead
            """);
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 200_000, 21, 50_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));
        // Row groups of 90 000 rows (each two batches, the second partial), the last of 70 000.
        DemoSampleWriter.Write(Path.Combine(_dir, "surrogate.parquet"), DemoScenarioParameters.Drifted, 250_000, 22, 90_000);

        var reports = new[] { 1, 2, 3 }.Select(t => ContractRun.Run(contract, parallelism: t)).ToList();

        Assert.Equal(250_000, reports[0].Events);
        Assert.Equal(5, reports[0].Outcomes.Count); // the ks-max of each feature (the two tests are diagnostics)
        AssertSameNumbers(reports);
    }

    private static void AssertSameNumbers(IReadOnlyList<RunResult> reports)
    {
        var one = reports[0];
        foreach (var other in reports.Skip(1))
        {
            Assert.Equal(one.Events, other.Events);
            Assert.Equal(one.SumW, other.SumW);
            Assert.Equal(one.Outcomes.Count, other.Outcomes.Count);
            for (var i = 0; i < one.Outcomes.Count; i++)
            {
                var (a, b) = (one.Outcomes[i], other.Outcomes[i]);
                var what = $"{a.Subject.Name} {a.Check.Label}";
                Assert.Equal(a.Verdict, b.Verdict);
                Assert.True(a.Measured.Estimate.Equals(b.Measured.Estimate), $"{what}: estimate {a.Measured.Estimate:R} vs {b.Measured.Estimate:R}");
                Assert.True(a.Measured.Lower.Equals(b.Measured.Lower), $"{what}: lower {a.Measured.Lower:R} vs {b.Measured.Lower:R}");
                Assert.True(a.Measured.Upper.Equals(b.Measured.Upper), $"{what}: upper {a.Measured.Upper:R} vs {b.Measured.Upper:R}");
                Assert.True(a.Measured.PValue.Equals(b.Measured.PValue), $"{what}: p {a.Measured.PValue:R} vs {b.Measured.PValue:R}");
                Assert.Equal(a.Summary, b.Summary);
            }
        }
    }
}
