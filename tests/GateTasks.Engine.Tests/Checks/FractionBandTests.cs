using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.References;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// fraction-max on a discrete multiplicity decided as one multinomial effect (<see cref="FractionBand"/>): the p-value
/// of "within tolerance" is the smaller of the union bound at the least favourable differences and Šidák's (1967)
/// bound, on the effect's own scale, so a shift between the large categories is not charged for every sparse one.
/// </summary>
public sealed class FractionBandTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-fraction-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    // Category counts of n_jets = 0..12: the reference is 100 000 × Poisson(2.2) probabilities (capped at 12),
    // rounded; the surrogate has 600 events with 15% of them (90) moved from n_jets = 2 to n_jets = 3.
    private static readonly int[] ReferenceCounts = [11080, 24377, 26814, 19664, 10815, 4759, 1745, 548, 151, 37, 8, 2, 0];
    private static readonly int[] ShiftedCounts = [67, 146, 71, 208, 65, 29, 10, 3, 1, 0, 0, 0, 0];

    private string Csv(string name, int[] counts)
    {
        var path = Path.Combine(_dir, name);
        File.WriteAllLines(path, new[] { "n_jets" }.Concat(counts.SelectMany((n, c) => Enumerable.Repeat(c.ToString(System.Globalization.CultureInfo.InvariantCulture), n))));
        return path;
    }

    private PrecisionContract Contract(double tolerance)
    {
        var path = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(path, $"""
            contract-version: 1
            sample: surrogate.csv
            reference: ref.parquet
            decision:
              confidence: 0.95
              false-alarm: 0.01
            features:
              - name: n_jets
                kind: discrete
                checks:
                  fraction-max: {tolerance.ToString(System.Globalization.CultureInfo.InvariantCulture)}
            """);
        var contract = ContractLoader.Load(path);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [Csv("full.csv", ReferenceCounts)], null, "test"));
        return contract;
    }

    [Fact]
    public void A_fifteen_percent_multiplicity_shift_fails_where_per_category_bonferroni_left_it_open()
    {
        var contract = Contract(0.1);
        Csv("surrogate.csv", ShiftedCounts);
        var outcome = ContractRun.Run(contract).Outcomes.Single();

        // scipy 1.10.1 on the same counts (12 categories with events; σ_c = √(f_c(1−f_c)(1/100000 + 1/600)), f the
        // reference fractions; u = max|Δ| − 0.1): union bound
        // sum(scipy.stats.norm.sf(u/σ) + scipy.stats.norm.sf((u + 0.2)/σ)) = 0.006273307806554342, Šidák's bound
        // -numpy.expm1(sum(numpy.log1p(-2*scipy.stats.norm.sf(u/σ)))) = 0.012496958553785933; the smaller is the p-value.
        Assert.Equal(0.006273307806554342, outcome.Measured.PValue, 1e-9);
        Assert.Equal(0.15002666666666667, outcome.Measured.Estimate, 1e-12);
        // One check in the family: p ≤ 0.01 fails. Per-category Bonferroni of the standardised deviations gave
        // 12 × scipy.stats.norm.sf(max((|Δ_c| − 0.1)/σ_c)) = 0.012677586917161166 > 0.01: inconclusive, though the
        // 95% interval lay above the tolerance.
        Assert.Equal(Verdict.Fail, outcome.Verdict);
        Assert.True(outcome.Measured.Lower > 0.1, $"simultaneous lower bound {outcome.Measured.Lower}");
    }

    [Fact]
    public void A_faithful_multiplicity_passes_and_a_sparse_category_alone_does_not_decide()
    {
        var contract = Contract(0.02);
        // The reference's own fractions at 20 000 events, with the sparse tail (n_jets ≥ 9) emptied: the differences
        // there are at most 0.0005, far inside the tolerance.
        Csv("surrogate.csv", [2216, 4875, 5363, 3933, 2163, 952, 349, 110, 39, 0, 0, 0, 0]);
        var outcome = ContractRun.Run(contract).Outcomes.Single();
        Assert.Equal(Verdict.Pass, outcome.Verdict);
        Assert.Equal(1.0, outcome.Measured.PValue); // every |Δ_c| below the tolerance: no evidence against it (u ≤ 0)
    }
}
