using System.Globalization;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Planning;
using GateTasks.Engine.References;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Planning;

/// <summary>
/// Planning a pair's correlation check: its coefficient is simulated at the variance the check uses (the reference's
/// own fourth moments), so the planned size is the one the check's pass rule needs, for a normal and a heavy-tailed pair.
/// </summary>
public sealed class CorrelationPlanTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-correlation-plan-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private (PrecisionContract, ReferenceHistograms) Setup(Func<Random, (double X, double Y)> draw, int events, double tolerance)
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, $$"""
            contract-version: 1
            sample: s.csv
            reference: ref.parquet
            defaults:
              binning: { bins: 20, spacing: quantile }
            features:
              - name: x
                checks: { mean-shift-max: 1000 }
              - name: y
                checks: { mean-shift-max: 1000 }
            correlations:
              - features: [x, y]
                pearson-max: {{tolerance.ToString(CultureInfo.InvariantCulture)}}
                chi2-2d-test: on
            """);
        var contract = ContractLoader.Load(contractPath);
        var rng = new Xoshiro256StarStar(5, threadSafe: false);
        var csv = Path.Combine(_dir, "fullsim.csv");
        File.WriteAllLines(csv, new[] { "x,y" }.Concat(Enumerable.Range(0, events).Select(_ =>
        {
            var (x, y) = draw(rng);
            return string.Create(CultureInfo.InvariantCulture, $"{x:R},{y:R}");
        })));
        var reference = ReferenceBuilder.Build(contract, [csv], null, "test");
        return (contract, reference);
    }

    /// <summary>
    /// The size at which the check's pass rule (docs/contract.md: pass when |Δr| + z₀.₉₅·se &lt; tolerance, se² =
    /// V/N_ref + V/n with V = n·Var(r)) passes a perfect surrogate with probability 0.95: Δr is normal with that se, so
    /// P(pass) = 2Φ(tol/se − z₀.₉₅) − 1 = 0.95 at se = tol/(z₀.₉₅ + z₀.₉₇₅), n = V/(se² − V/N_ref).
    /// </summary>
    private static double PassSize(double v, double referenceEvents, double tolerance)
    {
        var se = tolerance / (Normal.InvCDF(0, 1, 0.95) + Normal.InvCDF(0, 1, 0.975));
        return v / (se * se - v / referenceEvents);
    }

    [Fact]
    public void A_bivariate_normal_pair_is_planned_at_fishers_variance()
    {
        // y = 0.6 x + 0.8 z: a bivariate normal with ρ = 0.6, whose n·Var(r) is (1 − ρ²)² = 0.4096 (Fisher 1915).
        var (contract, reference) = Setup(rng => { var x = Normal.Sample(rng, 0, 1); return (x, 0.6 * x + 0.8 * Normal.Sample(rng, 0, 1)); }, 200_000, 0.02);
        var stored = reference.FindPair("x", "y")!;
        Assert.InRange(stored.PearsonVariance, 0.4096 * 0.95, 0.4096 * 1.05);
        var plan = PlanStudy.Run(contract, reference, 100_000, 200, 3);
        var row = plan.Checks.Single(c => c.Subject.Name == "x~y");
        var expected = PassSize(0.4096, stored.EffectiveCount, 0.02); // about 14 300
        // The grid steps by 2^¼ and the rate at each size carries 200 replicas' noise: within two steps either way.
        Assert.InRange((double)row.EventsToPass!.Value, expected / 1.42, expected * 1.42);
        Assert.Equal(DriftKind.CorrelationChange, row.Family);
        // At 10⁵ events the change failed with 95% power is about (z_fail + z₀.₉₅)·se, z_fail at α/m = 0.01/3 (Holm's
        // strictest level over the three tolerance checks): a few hundredths (the same normal law, hand-computed bound).
        var se = Math.Sqrt(0.4096 / stored.EffectiveCount + 0.4096 / 100_000);
        var drift = 0.02 + (Normal.InvCDF(0, 1, 1 - 0.01 / 3) + Normal.InvCDF(0, 1, 0.95)) * se;
        Assert.InRange(row.DetectableDrift!.Value, drift / 1.2, drift * 1.2);
        // The 2-D χ² test is a diagnostic: not planned, and named as such.
        Assert.Contains(plan.NotPlanned, n => n.Contains("x~y"));
        Assert.Equal(3, plan.Checks.Count);
    }

    [Fact]
    public void A_heavy_tailed_pair_is_planned_at_its_own_larger_variance()
    {
        // y = x (1 + 0.9 t₅) with x log-normal: n·Var(r) several times the bivariate-normal (1 − r²)²
        // (Steiger & Hakstian 1982: the fourth moments enter); the plan must need that many more events.
        var (contract, reference) = Setup(rng =>
        {
            var x = Math.Exp(Normal.Sample(rng, 0, 0.8));
            return (x, x * (1 + 0.9 * StudentT.Sample(rng, 0, 1, 5)));
        }, 400_000, 0.06);
        var stored = reference.FindPair("x", "y")!;
        var normalV = Math.Pow(1 - stored.Pearson * stored.Pearson, 2);
        Assert.True(stored.PearsonVariance > 2 * normalV, $"V {stored.PearsonVariance} against the normal {normalV}");
        var plan = PlanStudy.Run(contract, reference, 100_000, 200, 3);
        var planned = (double)plan.Checks.Single(c => c.Subject.Name == "x~y").EventsToPass!.Value;
        var expected = PassSize(stored.PearsonVariance, stored.EffectiveCount, 0.06);
        Assert.InRange(planned, expected / 1.42, expected * 1.42);
        Assert.True(planned > 1.5 * PassSize(normalV, stored.EffectiveCount, 0.06));
    }
}
