using System.Globalization;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.References;
using GateTasks.Engine.Runs;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Tests.Checks;

/// <summary>
/// Quantile shifts read off the fine grids: the quantile of a piecewise-linear CDF, and a long-tailed feature's
/// shift against its closed form, where a coarse bin's average density read it a third too small.
/// </summary>
public sealed class QuantileFineGridTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-quantile-fine-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    [Fact]
    public void Quantiles_and_density_of_a_piecewise_linear_cdf_by_hand()
    {
        // Edges 0, 1, 2, 4; weights: underflow 0, [0,1) 1, [1,2) 2, [2,4) 1, overflow 0 (total 4). By hand:
        // F(0) = 0, F(1) = 0.25, F(2) = 0.75, F(4) = 1. Q(0.5) = 1 + (0.5 − 0.25)/0.5 · 1 = 1.5; Q(0.9) = 2 + 0.15/0.25 · 2 = 3.2.
        var cdf = new FineGridCdf(new FineGridCells([0, 1, 2, 4], [0, 1, 2, 1, 0], [0, 1, 2, 1, 0], 0, 0, 0, 0));
        Assert.Equal(1.5, cdf.Quantile(0.5), 12);
        Assert.Equal(3.2, cdf.Quantile(0.9), 12);
        Assert.Equal(0.0, cdf.Quantile(0.0), 12);
        // The density at the median, h = 0.01: 0.02/(Q(0.51) − Q(0.49)) = 0.02/0.04 = 0.5 (weight 2 of 4 over a unit width).
        Assert.Equal(0.5, cdf.DensityAt(0.5), 12);
    }

    [Fact]
    public void A_scaled_log_normal_reads_its_closed_form_shift_at_the_tail_quantile()
    {
        File.WriteAllText(Path.Combine(_dir, "precision-contract.yaml"), """
            contract-version: 1
            sample: surrogate.csv
            reference: ref.parquet
            decision: { inconclusive: warn }
            defaults:
              binning: { bins: 20, spacing: quantile }
              core: 0.90
            features:
              - name: e
                checks: { quantile-shift-max: 0.04 }
            """);
        var contract = ContractLoader.Load(Path.Combine(_dir, "precision-contract.yaml"));
        void Write(string name, int seed, double scale)
        {
            var normal = new Normal(3, 0.8, new Xoshiro256StarStar(seed));
            File.WriteAllLines(Path.Combine(_dir, name), new[] { "e" }.Concat(Enumerable.Range(0, 400_000)
                .Select(_ => (Math.Exp(normal.Sample()) * scale).ToString("R", CultureInfo.InvariantCulture))));
        }
        Write("full.csv", 1, 1);
        var reference = ReferenceBuilder.Build(contract, [Path.Combine(_dir, "full.csv")], null, "test");
        Assert.NotNull(reference.Find("e")!.FineGrid); // kept for the quantile check alone
        ReferenceFile.Write(contract.ReferenceFullPath, reference);
        Write("surrogate.csv", 2, 1.028);
        var outcome = ContractRun.Run(contract).Outcomes.Single();
        // Closed form (log-normal(3, 0.8)): values × 1.028 move the p-quantile by 0.028·exp(3 + 0.8 z_p); the largest
        // of the 5%, 50% and 95% quantiles is the 95% one, over σ = e^(3 + 0.32)·√(e^0.64 − 1): 0.080056 (scipy 1.10.1 stats.norm.ppf for z_0.95).
        var sigma = Math.Exp(3 + 0.32) * Math.Sqrt(Math.Exp(0.64) - 1);
        var truth = 0.028 * Math.Exp(3 + 0.8 * Normal.InvCDF(0, 1, 0.95)) / sigma;
        Assert.Equal(0.080056, truth, 5);
        // 400 000 events a side leave a standard error of about 0.008 on the 95% quantile's shift; the coarse
        // bins' average density gave 0.051 here.
        Assert.InRange(outcome.Value, truth - 0.02, truth + 0.02);
        Assert.Equal(Verdict.Fail, outcome.Verdict);
        Assert.Contains(outcome.Measured.Details, d => d.Key == "quantile_grid");
    }
}
