using System.Globalization;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Planning;
using GateTasks.Engine.References;
using GateTasks.Engine.Runs;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Calibration;

/// <summary>
/// The simulation studies measure wasserstein-max on the reference's fine grid, as a check does: a replica of a
/// perfect surrogate gets a W1 estimate and upper bound of the size the check gives on a real sample of the same size
/// drawn from the same law, and the plan then finds a finite size to pass a tolerance the fine grid can resolve.
/// These compare the program with itself (replicas against the check run by <see cref="ContractRun"/>); the samples are
/// drawn by MathNet.Numerics' seeded LogNormal sampler.
/// </summary>
public sealed class FineGridReplicaTests : IDisposable
{
    private const int ReferenceEvents = 200_000;
    private const int SampleEvents = 100_000;
    private const double Tolerance = 0.02;

    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-fine-replica-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private static void WriteLogNormal(string path, int n, int seed)
    {
        var rng = new Xoshiro256StarStar(seed, threadSafe: false);
        using var w = new StreamWriter(path);
        w.WriteLine("energy");
        for (var i = 0; i < n; i++) w.WriteLine(LogNormal.Sample(rng, 3, 0.8).ToString("R", CultureInfo.InvariantCulture));
    }

    private (PrecisionContract, ReferenceHistograms) Setup(string check = "wasserstein-max")
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, $"""
            contract-version: 1
            sample: sample.csv
            reference: reference.parquet
            defaults:
              binning: {"{"} bins: 20, spacing: quantile {"}"}
            features:
              - name: energy
                checks:
                  {check}: {Tolerance.ToString(CultureInfo.InvariantCulture)}
            """);
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.csv");
        WriteLogNormal(fullsim, ReferenceEvents, 11);
        var reference = ReferenceBuilder.Build(contract, [fullsim], null, "test");
        ReferenceFile.Write(contract.ReferenceFullPath, reference);
        return (contract, reference);
    }

    /// <summary>Eight replicas of a perfect surrogate and the check on four real samples of the same law and size.</summary>
    private (List<Measurement> Replicas, List<Measurement> Checks) ReplicasAndChecks(PrecisionContract contract, ReferenceHistograms reference)
    {
        var feature = Assert.Single(ReplicaFeature.All(contract, reference));
        var check = Assert.Single(feature.Spec.Checks);
        var rng = new Random(5);
        var replicas = Enumerable.Range(0, 8)
            .Select(_ => CheckEvaluator.Measure(feature.Draw(feature.Probabilities(Drift.Null), Drift.Null, SampleEvents, rng), check, contract.Decision))
            .ToList();
        var checks = Enumerable.Range(0, 4).Select(t =>
        {
            var sample = Path.Combine(_dir, $"sample-{t}.csv");
            WriteLogNormal(sample, SampleEvents, 100 + t);
            return Assert.Single(ContractRun.Run(contract, sample).Outcomes).Measured;
        }).ToList();
        return (replicas, checks);
    }

    [Fact]
    public void A_replica_of_a_perfect_surrogate_measures_w1_as_the_check_does_on_a_real_sample()
    {
        var (contract, reference) = Setup();
        Assert.NotNull(reference.Find("energy")!.FineGrid);
        var (replicas, checks) = ReplicasAndChecks(contract, reference);
        // The program against itself: the check on real samples of the law is the yardstick for the replicas. Both
        // grids must be the fine one (the coarse bins give an upper bound several times larger).
        Assert.All(replicas, m => Assert.Contains(m.Details, d => d.Key == "w1_grid" && d.Value.StartsWith("fine grid", StringComparison.Ordinal)));
        var (replicaUpper, checkUpper) = (replicas.Average(m => m.Upper), checks.Average(m => m.Upper));
        var (replicaEstimate, checkEstimate) = (replicas.Average(m => m.Estimate), checks.Average(m => m.Estimate));
        Assert.InRange(replicaUpper / checkUpper, 0.6, 1.6);
        Assert.InRange(replicaEstimate / checkEstimate, 0.5, 2.0);
    }

    [Fact]
    public void The_plan_finds_a_finite_size_for_a_w1_tolerance_the_fine_grid_resolves()
    {
        var (contract, reference) = Setup();
        var plan = PlanStudy.Run(contract, reference, detectionEvents: SampleEvents, replicas: 40, seed: 1);
        var w1 = Assert.Single(plan.Checks);
        Assert.NotNull(w1.EventsToPass);
        // Before the replicas drew fine grids, W1 fell back to the 20 coarse bins and this plan said "never". The plan
        // finds a size below the whole reference's (a tolerance ten times W1's noise there).
        Assert.InRange(w1.EventsToPass!.Value, 1_000, ReferenceEvents);
    }

    [Fact]
    public void A_replica_of_a_perfect_surrogate_measures_the_quantile_shift_as_the_check_does_on_a_real_sample()
    {
        var (contract, reference) = Setup("quantile-shift-max");
        var (replicas, checks) = ReplicasAndChecks(contract, reference);
        // The program against itself, as for W1: both read the fine grid, and the replicas' upper bounds are of the size
        // the check gives on real samples. (With the replicas on the coarse bins, plan sized a 0.08 tolerance at a sixth
        // of what the check needs: DEVELOPERS.md, plan agreement study.)
        Assert.All(replicas, m => Assert.Contains(m.Details, d => d.Key == "quantile_grid" && d.Value.StartsWith("fine grid", StringComparison.Ordinal)));
        string Show(IEnumerable<Measurement> ms) => string.Join("\n", ms.Select(m => $"{m.Estimate} {m.Upper} " + string.Join(" ", m.Details.Select(d => d.Key + "=" + d.Value))));
        var (replicaUpper, checkUpper) = (replicas.Average(m => m.Upper), checks.Average(m => m.Upper));
        Assert.True(replicaUpper / checkUpper is > 0.6 and < 1.6, "replicas:\n" + Show(replicas) + "\nchecks:\n" + Show(checks));
    }
}
