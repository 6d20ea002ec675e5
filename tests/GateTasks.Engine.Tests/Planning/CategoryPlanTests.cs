using System.Globalization;
using GateTasks.Engine.Calibration;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Planning;
using GateTasks.Engine.References;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Planning;

/// <summary>
/// Planning a category block and a long-tailed feature: a category is simulated at its share of the whole sample, and
/// replicas carry the reference's unbinned moments, not moments at bin centres.
/// </summary>
public sealed class CategoryPlanTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-category-plan-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private (PrecisionContract, ReferenceHistograms) Setup(string features, Func<Random, string> row, string header, int events)
    {
        var contractPath = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contractPath, $"""
            contract-version: 1
            sample: s.csv
            reference: ref.parquet
            defaults:
              binning: {"{"} bins: 20, spacing: quantile {"}"}
            features:
            {features}
            """);
        var contract = ContractLoader.Load(contractPath);
        var rng = new Xoshiro256StarStar(11, threadSafe: false);
        var csv = Path.Combine(_dir, "fullsim.csv");
        File.WriteAllLines(csv, new[] { header }.Concat(Enumerable.Range(0, events).Select(_ => row(rng))));
        var reference = ReferenceBuilder.Build(contract, [csv], null, "test");
        ReferenceFile.Write(contract.ReferenceFullPath, reference);
        return (contract, reference);
    }

    [Fact]
    public void A_small_category_is_planned_in_the_whole_samples_events_at_its_share()
    {
        // x ~ N(0, 1) with 5% of events in c = 1; the category's own tolerance is the feature's.
        var (contract, reference) = Setup("""
              - name: x
                checks: { mean-shift-max: 0.05 }
                categories: { by: c, values: [0, 1] }
            """, rng => string.Create(CultureInfo.InvariantCulture, $"{Normal.Sample(rng, 0, 1):R},{(rng.NextDouble() < 0.05 ? 1 : 0)}"), "x,c", 400_000);
        var plan = PlanStudy.Run(contract, reference, 100_000, 200, 3);
        var whole = plan.Checks.Single(c => c.Subject.Name == "x").EventsToPass!.Value;
        var small = plan.Checks.Single(c => c.Subject.Name == "x[c=1]").EventsToPass!.Value;
        // The mean's noise at N sample events is that of N·share category events (σ/√(N·share), Cramér 1946 §27.2),
        // so the category needs about 1/share = 20 times the events the whole feature does. The reference's noise
        // (20 000 category events) adds a little. The grid steps by 2^¼, and each size carries its replicas' noise:
        // a factor of 1.5 either way. (Compares the program's plan of two features with each other.) Before, the
        // category was drawn at the whole sample's size and planned within a step of the feature (ratio about 1).
        var ratio = (double)small / whole;
        Assert.True(ratio > 20 / 1.5 && ratio < 20 * 1.5, $"category {small} events, feature {whole} events: ratio {ratio:0.##}");
    }

    [Fact]
    public void Replica_moments_are_the_unbinned_ones_for_a_long_tailed_feature()
    {
        // energy ~ lognormal(3, 0.8): σ = e^(μ+s²/2)·√(e^(s²) − 1) = 26.0 (closed form of the lognormal law).
        var (contract, reference) = Setup("""
              - name: energy
                checks: { quantile-shift-max: 0.1 }
            """, rng => LogNormal.Sample(rng, 3, 0.8).ToString("R", CultureInfo.InvariantCulture), "energy", 200_000);
        var sigma = Math.Exp(3 + 0.32) * Math.Sqrt(Math.Exp(0.64) - 1);
        var feature = ReplicaFeature.All(contract, reference).Single();
        var rng = new Xoshiro256StarStar(5, threadSafe: false);
        var sds = Enumerable.Range(0, 50).Select(_ => feature.Draw(feature.Probabilities(Drift.Null), Drift.Null, 100_000, rng))
            .SelectMany(c => new[] { c.Reference.Summary.StandardDeviation, c.SurrogateSummary.StandardDeviation }).ToList();
        // Within 5% of the law's σ (the lognormal's sample σ at 10⁵ events is uncertain by about 3%, from its
        // kurtosis). At bin centres the outermost bin (the 95% quantile to the largest value) put σ at about 3× this.
        Assert.All(sds, sd => Assert.True(Math.Abs(sd / sigma - 1) < 0.05, $"replica σ {sd:0.##} against the law's {sigma:0.##}"));
    }
}
