using System.Diagnostics;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// Fan-out: four shards of a sample accumulated apart and merged give what one pass over the whole sample gives —
/// the same bits for every binned check, the same values to rounding for moments and coefficients, the same verdicts.
/// These tests compare the program with itself (one pass against merged shards); they have no outside source.
/// </summary>
public sealed class ShardMergeTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-shards-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Four_shards_merged_decide_as_one_pass(bool drifted)
    {
        // The demo's contract (categories, a spike, far tails, pairs with a 2-D χ²; the joint block's shards are tested
        // through the CLI in ShardCommandTests).
        var contractPath = Path.Combine(_dir, DemoContract.FileName);
        File.WriteAllText(contractPath, DemoContract.Text.Replace("path: surrogate-faithful.parquet", "path: shard-*.parquet"));
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 300_000, 11, 50_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));
        var scenario = drifted ? DemoScenarioParameters.Drifted : DemoScenarioParameters.FullSimulation;
        var shards = Enumerable.Range(0, 4).Select(k =>
        {
            var path = Path.Combine(_dir, $"shard-{k}.parquet");
            DemoSampleWriter.Write(path, scenario, 40_000 + 5_000 * k, 100 + k, 10_000);
            return path;
        }).ToList();

        var whole = ContractRun.Run(contract);

        var setup = MatchedReference.Load(contract);
        var parts = shards.Select(s => ContractRun.Accumulate(setup, ContractRun.OpenSample(contract, [s]))).ToList();
        var merged = parts[2];
        foreach (var k in new[] { 0, 3, 1 }) merged.Merge(parts[k]);
        var fanned = ContractRun.Decide(setup, merged.Finish(), shards, DateTimeOffset.UtcNow, Stopwatch.StartNew());

        Assert.Equal(whole.Events, fanned.Events);
        Assert.Equal(whole.SumW, fanned.SumW); // exact sums: the same bits
        Assert.Equal(whole.NoCheckFailed(), fanned.NoCheckFailed());
        // Sized for 10⁶ events, the contract leaves some checks undecided at 1.7·10⁵; the drifted sample fails many.
        Assert.Equal(drifted, whole.Failures > 0);
        Assert.Equal(whole.Outcomes.Count, fanned.Outcomes.Count);
        for (var i = 0; i < whole.Outcomes.Count; i++)
        {
            var (a, b) = (whole.Outcomes[i], fanned.Outcomes[i]);
            var what = $"{a.Subject.Name} {a.Check.Label}";
            Assert.Equal(what, $"{b.Subject.Name} {b.Check.Label}");
            Assert.True(a.Verdict == b.Verdict, $"{what}: {a.Verdict} vs {b.Verdict}");
            switch (a.Check.Kind)
            {
                case CheckKind.MeanShift or CheckKind.WidthRatio or CheckKind.PearsonDifference or CheckKind.SpearmanDifference:
                    // Unbinned moments and coefficients merge by Chan et al.'s update: equal to rounding.
                    Assert.True(Math.Abs(a.Measured.Estimate - b.Measured.Estimate) <= 1e-9 * Math.Max(1e-3, Math.Abs(a.Measured.Estimate)), $"{what}: {a.Measured.Estimate} vs {b.Measured.Estimate}");
                    // The upper bound rests on the merged variance (for the coefficients, the fourth co-moments): to rounding too.
                    Assert.True(Math.Abs(a.Measured.Upper - b.Measured.Upper) <= 1e-9 * Math.Max(1e-3, Math.Abs(a.Measured.Upper)), $"{what}: upper {a.Measured.Upper} vs {b.Measured.Upper}");
                    break;
                default:
                    Assert.True(a.Measured.Estimate.Equals(b.Measured.Estimate), $"{what}: estimate {a.Measured.Estimate:R} vs {b.Measured.Estimate:R}");
                    Assert.True(a.Measured.Upper.Equals(b.Measured.Upper), $"{what}: upper {a.Measured.Upper:R} vs {b.Measured.Upper:R}");
                    Assert.True(a.Measured.PValue.Equals(b.Measured.PValue), $"{what}: p {a.Measured.PValue:R} vs {b.Measured.PValue:R}");
                    break;
            }
        }
    }
}
