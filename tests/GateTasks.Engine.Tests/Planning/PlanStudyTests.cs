using System.Globalization;
using System.Text;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Planning;
using GateTasks.Engine.References;
using GateTasks.Engine.Tests.Samples;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Planning;

/// <summary>
/// The plan against event-level simulation through the real pipeline: trials draw a fresh reference sample and a
/// surrogate sample of events from the true distribution (a normal law, not the reference histogram the plan's
/// replicas use), build the reference, and check, as a team would. The share of trials that pass (or catch the drift)
/// must agree with the plan's simulated rate within the noise of both.
/// </summary>
public sealed class PlanStudyTests : IDisposable
{
    private const int ReferenceEvents = 50_000;
    private const int TrialCount = 40;
    private const int Replicas = 400;

    private const string ContractText = """
        contract-version: 1
        sample: sample.csv
        reference: reference.parquet
        defaults:
          binning: { bins: 20, spacing: quantile }
        features:
          - name: x
            checks:
              ks-max: 0.04
              mean-shift-max: 0.04
              ratio-max: { core: 0.12, tails: 0.3 }
        """;

    private readonly TemporaryFolder _folder = new();

    public void Dispose() => _folder.Dispose();

    /// <summary>n events of x = (10 + 2z)(1 + scale), z standard normal (Box–Muller), as CSV.</summary>
    private static void Draw(string path, int seed, long n, double scale = 0)
    {
        var random = new Random(seed);
        var csv = new StringBuilder("x\n");
        for (var i = 0; i < n; i++)
        {
            var z = Math.Sqrt(-2 * Math.Log(1 - random.NextDouble())) * Math.Cos(2 * Math.PI * random.NextDouble());
            csv.Append(((10 + 2 * z) * (1 + scale)).ToString("R", CultureInfo.InvariantCulture)).Append('\n');
        }
        File.WriteAllText(path, csv.ToString());
    }

    /// <summary>A contract in its own folder with a reference built from a fresh draw of the truth.</summary>
    private (PrecisionContract Contract, ReferenceHistograms Reference) Setup(string name, int seed)
    {
        var contractPath = _folder.File(Path.Combine(name, "precision-contract.yaml"));
        File.WriteAllText(contractPath, ContractText);
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(Path.GetDirectoryName(contractPath)!, "fullsim.csv");
        Draw(fullsim, seed, ReferenceEvents);
        var reference = ReferenceBuilder.Build(contract, [fullsim], null, "test");
        ReferenceFile.Write(contract.ReferenceFullPath, reference);
        return (contract, reference);
    }

    /// <summary>The verdicts of <see cref="TrialCount"/> event-level trials: each a fresh reference and a surrogate of n events.</summary>
    private List<IReadOnlyList<CheckOutcome>> Trials(string name, long n, double scale)
    {
        var results = new IReadOnlyList<CheckOutcome>[TrialCount];
        Parallel.For(0, TrialCount, t =>
        {
            var (contract, _) = Setup($"{name}-{t}", 1000 + t);
            var sample = Path.Combine(contract.Directory, "sample.csv");
            Draw(sample, 5000 + t, n, scale);
            results[t] = ContractRun.Run(contract, sample).Outcomes;
        });
        return [.. results];
    }

    private static void AssertAgrees(double planned, double observed, string what)
    {
        // Both are binomial shares: the plan's of its replicas, the trials' of theirs; three standard deviations.
        var noise = Math.Sqrt(planned * (1 - planned) * (1.0 / TrialCount + 1.0 / Replicas));
        Assert.True(Math.Abs(observed - planned) <= 3 * Math.Max(noise, 1.0 / TrialCount),
            $"{what}: the plan says {planned:0.###}, {TrialCount} event-level trials gave {observed:0.###} (noise {noise:0.###})");
    }

    [Fact]
    public void A_perfect_surrogate_passes_at_the_planned_rate_at_the_planned_size_and_below_it()
    {
        var (contract, reference) = Setup("plan", 1);
        var plan = PlanStudy.Run(contract, reference, null, Replicas, 3);
        Assert.NotNull(plan.ContractEvents);
        var n = plan.ContractEvents!.Value;
        Assert.True(plan.ContractPassRate >= contract.Decision.Confidence);

        foreach (var size in new[] { n, n / 2 })
        {
            var planned = PlanStudy.PassRate(contract, reference, size, Replicas, 11);
            var observed = Trials($"pass-{size}", size, 0).Count(o => o.All(x => x.Verdict == Verdict.Pass)) / (double)TrialCount;
            AssertAgrees(planned, observed, $"pass rate at {size} events");
        }
    }

    [Fact]
    public void A_drift_of_the_detectable_size_is_caught_at_the_stated_power()
    {
        var (contract, reference) = Setup("plan", 1);
        var plan = PlanStudy.Run(contract, reference, 20_000, Replicas, 3);
        var meanShift = plan.Checks.Single(c => c.Check.Kind == CheckKind.MeanShift);
        Assert.Equal(GateTasks.Engine.Calibration.DriftKind.Scale, meanShift.Family);
        Assert.NotNull(meanShift.DetectableDrift);
        Assert.True(meanShift.DetectionRate >= plan.Power);
        // The noise-free effect of that scale shift: the mean moves by 10·s, in units of σ = 2 (to first order in s).
        Assert.Equal(10 * meanShift.DetectableDrift!.Value / 2, meanShift.EffectAtDrift!.Value, 0.1 * meanShift.EffectAtDrift.Value);

        var trials = Trials("drift", 20_000, meanShift.DetectableDrift.Value);
        var caught = trials.Count(o => o.Single(x => x.Check.Kind == CheckKind.MeanShift).Verdict == Verdict.Fail) / (double)TrialCount;
        AssertAgrees(meanShift.DetectionRate, caught, "detection rate of the stated drift");
    }
}
