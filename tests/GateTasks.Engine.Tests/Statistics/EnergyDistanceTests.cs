using System.Text.Json;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Statistics;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class EnergyDistanceTests
{
    // tests/fixtures/scipy/energy.json, written by tests/fixtures/scipy/make_energy_fixtures.py with Debian's
    // python3-scipy 1.10.1 / numpy 1.24.2; each case records its exact call.
    private static readonly Lazy<JsonDocument> Fixture = new(() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "scipy", "energy.json"))));

    private static JsonElement EnergyCase(string section, string name) =>
        Fixture.Value.RootElement.GetProperty(section).EnumerateArray().First(c => c.GetProperty("name").GetString() == name);

    private static double[][] Rows(JsonElement c, string property) =>
        c.GetProperty(property).EnumerateArray().Select(r => r.EnumerateArray().Select(v => v.GetDouble()).ToArray()).ToArray();

    [Fact]
    public void FixtureRecordsTheScipyVersion()
    {
        Assert.Equal("1.10.1", Fixture.Value.RootElement.GetProperty("scipy").GetString());
        Assert.Equal("1.24.2", Fixture.Value.RootElement.GetProperty("numpy").GetString());
    }

    [Theory]
    [InlineData("normal_shift_60_45_d3")]
    [InlineData("correlated_vs_shuffled_80_70_d2")]
    [InlineData("univariate_rows_50_40_d1")]
    public void PermutationTestReportsTheSameStatisticAsTheDirectSum(string name)
    {
        // numpy 1.24.2 direct O(N²) computation of the V-statistic definition (call in fixture), energy_multivariate/<name>
        var c = EnergyCase("energy_multivariate", name);
        EnergyDistanceResult r = EnergyDistance.PermutationTest(Rows(c, "x"), Rows(c, "y"), 99, 1);
        Near(c.Double("e_statistic"), r.EStatistic, 1e-11);
        Near(c.Double("test_statistic"), r.TestStatistic, 1e-11);
        Assert.Equal(99, r.Permutations);
        Assert.InRange(r.PValue, 0.01, 1.0);
    }

    [Fact]
    public void OneFeatureRowsGiveTheSquareOfScipysEnergyDistance()
    {
        // scipy 1.10.1 stats.energy_distance(x[:,0], y[:,0]) ** 2, fixture energy_multivariate/univariate_rows_50_40_d1
        var c = EnergyCase("energy_multivariate", "univariate_rows_50_40_d1");
        Near(c.Double("scipy_energy_distance_squared"), EnergyDistance.PermutationTest(Rows(c, "x"), Rows(c, "y"), 1, 1).EStatistic, 1e-11);
    }

    [Fact]
    public void PermutationTestIsReproducibleForASeed()
    {
        double[][] x = CorrelatedNormal(200, 0.8, 3), y = CorrelatedNormal(150, 0.8, 4);
        Assert.Equal(EnergyDistance.PermutationTest(x, y, 99, 17), EnergyDistance.PermutationTest(x, y, 99, 17));
    }

    [Fact]
    public void FaithfulPairIsNotRejected()
    {
        // Same 2-D normal (ρ = 0.8) for both samples: H0 holds, so p should not be small.
        double[][] x = CorrelatedNormal(1000, 0.8, 11), y = CorrelatedNormal(1000, 0.8, 12);
        EnergyDistanceResult r = EnergyDistance.PermutationTest(x, y, 199, 5);
        Assert.True(r.PValue > 0.01, $"p = {r.PValue}");
    }

    [Fact]
    public void DestroyedCorrelationIsRejected()
    {
        // Same marginals, correlation destroyed by shuffling y's second column: p must be small.
        double[][] x = CorrelatedNormal(1000, 0.8, 21), y = CorrelatedNormal(1000, 0.8, 22);
        double[] second = y.Select(r => r[1]).ToArray();
        new Xoshiro256StarStar(23, threadSafe: false).Shuffle(second);
        for (int i = 0; i < y.Length; i++) y[i][1] = second[i];
        EnergyDistanceResult r = EnergyDistance.PermutationTest(x, y, 199, 5);
        Assert.True(r.PValue < 0.01, $"p = {r.PValue}");
        Assert.Equal(1.0 / 200, r.PValue);
    }

    [Fact]
    public void PValuesUnderTheNullAreRoughlyUniform()
    {
        // Under H0 a permutation p-value is (discretely) uniform; 300 seeded replicas of 30 vs 30 rows.
        const int replicas = 300;
        var p = new double[replicas];
        for (int k = 0; k < replicas; k++)
            p[k] = EnergyDistance.PermutationTest(CorrelatedNormal(30, 0.5, 1000 + 2 * k), CorrelatedNormal(30, 0.5, 1001 + 2 * k), 99, k).PValue;
        // Mean of U(0,1) is 1/2 with SD 1/√12 per draw; allow 5 standard errors.
        Assert.InRange(p.Average(), 0.5 - 5 / Math.Sqrt(12 * replicas), 0.5 + 5 / Math.Sqrt(12 * replicas));
        // P(p ≤ 0.05) = 0.05 for B = 99; allow 5 binomial standard deviations.
        double small = p.Count(v => v <= 0.05) / (double)replicas;
        Assert.InRange(small, 0.0, 0.05 + 5 * Math.Sqrt(0.05 * 0.95 / replicas));
    }

    [Fact]
    public void SequentialStoppingGivesHOverLAndStaysValidUnderTheNull()
    {
        // Besag & Clifford (1991): stop at the h-th exceedance after L permutations, p = h/L; otherwise the full
        // (1 + g)/(1 + B). Either way P(p ≤ α) ≤ α under H0. 300 seeded null replicas, h = 5, B = 99.
        const int replicas = 300;
        var p = new double[replicas];
        int stopped = 0;
        for (int k = 0; k < replicas; k++)
        {
            var r = EnergyDistance.PermutationTest(CorrelatedNormal(30, 0.5, 1000 + 2 * k), CorrelatedNormal(30, 0.5, 1001 + 2 * k), 99, k, stopAfter: 5);
            if (r.Permutations < 99)
            {
                stopped++;
                Assert.Equal(5.0 / r.Permutations, r.PValue, 15);
            }
            p[k] = r.PValue;
        }
        Assert.True(stopped > replicas / 2, $"{stopped} of {replicas} stopped early"); // most null replicas stop early
        double small = p.Count(v => v <= 0.05) / (double)replicas;
        Assert.InRange(small, 0.0, 0.05 + 5 * Math.Sqrt(0.05 * 0.95 / replicas));
    }

    [Fact]
    public void SequentialStoppingChangesNothingWhereTheDataAreSignificant()
    {
        double[][] x = CorrelatedNormal(500, 0.8, 21), y = CorrelatedNormal(500, 0.8, 22);
        double[] second = y.Select(r => r[1]).ToArray();
        new Xoshiro256StarStar(23, threadSafe: false).Shuffle(second);
        for (int i = 0; i < y.Length; i++) y[i][1] = second[i];
        Assert.Equal(EnergyDistance.PermutationTest(x, y, 199, 5), EnergyDistance.PermutationTest(x, y, 199, 5, stopAfter: 20));
    }

    [Fact]
    public void IdenticalSamplesHaveZeroStatistic()
    {
        double[][] x = CorrelatedNormal(40, 0.3, 9);
        Near(0.0, EnergyDistance.PermutationTest(x, x, 1, 1).EStatistic, 0, 1e-13);
    }

    [Fact]
    public void BadInputIsReported()
    {
        double[][] ok = { new double[] { 1, 2 } };
        var empty = Assert.Throws<GateInputException>(() => EnergyDistance.PermutationTest(Array.Empty<double[]>(), ok, 9, 1));
        Assert.Equal(ErrorCodes.SampleEmpty, empty.Code);
        Assert.Throws<ArgumentException>(() => EnergyDistance.PermutationTest(ok, new[] { new double[] { 1, 2, 3 } }, 9, 1));
        Assert.Throws<ArgumentException>(() => EnergyDistance.PermutationTest(ok, new[] { new[] { 1, double.NaN } }, 9, 1));
        double[][] many = Enumerable.Range(0, EnergyDistance.MaxPooledRows).Select(i => new double[] { i, 0 }).ToArray();
        var tooMany = Assert.Throws<ArgumentException>(() => EnergyDistance.PermutationTest(many, ok, 9, 1));
        Assert.Contains("5000", tooMany.Message);
        Assert.Throws<ArgumentOutOfRangeException>(() => EnergyDistance.PermutationTest(ok, ok, 0, 1));
    }

    [Fact]
    public void StandardiseShiftsAndScalesEachFeature()
    {
        double[][] rows = { new double[] { 1, 10 }, new double[] { 3, 30 } };
        double[][] z = EnergyDistance.Standardise(rows, new double[] { 2, 20 }, new double[] { 1, 10 });
        Assert.Equal(new double[] { -1, -1 }, z[0]);
        Assert.Equal(new double[] { 1, 1 }, z[1]);
        Assert.Equal(new double[] { 1, 10 }, rows[0]);
        Assert.Throws<ArgumentException>(() => EnergyDistance.Standardise(rows, new double[] { 0, 0 }, new double[] { 1, 0 }));
        Assert.Throws<ArgumentException>(() => EnergyDistance.Standardise(rows, new double[] { 0 }, new double[] { 1 }));
    }

    [Theory]
    [InlineData("weighted_univariate_rows_60_50_d1")]
    [InlineData("signed_weights_70_60_d2")]
    public void WeightedRowsGiveTheWeightedVStatistic(string name)
    {
        // numpy 1.24.2 direct weighted V-statistic with normalised weights (call in fixture), energy_weighted/<name>
        var c = EnergyCase("energy_weighted", name);
        var r = EnergyDistance.PermutationTest(Rows(c, "x"), Rows(c, "y"), 1, 1, xWeights: c.Doubles("x_weights"), yWeights: c.Doubles("y_weights"));
        Near(c.Double("e_statistic"), r.EStatistic, 1e-11);
    }

    [Fact]
    public void PositivelyWeightedOneFeatureRowsGiveTheSquareOfScipysWeightedEnergyDistance()
    {
        // scipy 1.10.1 stats.energy_distance(x[:,0], y[:,0], wx, wy) ** 2, fixture energy_weighted/weighted_univariate_rows_60_50_d1
        var c = EnergyCase("energy_weighted", "weighted_univariate_rows_60_50_d1");
        var r = EnergyDistance.PermutationTest(Rows(c, "x"), Rows(c, "y"), 1, 1, xWeights: c.Doubles("x_weights"), yWeights: c.Doubles("y_weights"));
        Near(c.Double("scipy_energy_distance_squared"), r.EStatistic, 1e-11);
    }

    [Fact]
    public void UnitWeightsGiveTheUnweightedResult()
    {
        // Compares the program with itself: weights of 1 must be the unweighted test, statistic and permutations alike.
        double[][] x = CorrelatedNormal(200, 0.8, 31), y = CorrelatedNormal(150, 0.6, 32);
        var plain = EnergyDistance.PermutationTest(x, y, 99, 17);
        var unit = EnergyDistance.PermutationTest(x, y, 99, 17, xWeights: Enumerable.Repeat(1.0, 200).ToArray(), yWeights: Enumerable.Repeat(1.0, 150).ToArray());
        Assert.Equal(plain, unit);
    }

    [Fact]
    public void A_weighted_sample_of_one_law_is_not_told_apart_from_an_unweighted_sample_of_it()
    {
        // Importance weighting (common practice): rows of the bivariate normal (correlation 0.5) shifted by (0.5, 0.25),
        // weighted by φ(x)/φ(x − 0.5) (the conditional of the second feature given x is the same in both laws), describe
        // the unshifted law the unweighted sample is drawn from. The weighted test keeps its level, the
        // test that ignores the weights sees the shift. Over 20 replicas at the 5% level: Binomial(20, 0.05) gives
        // P(X ≥ 4) = 0.016 (scipy 1.10.1: scipy.stats.binom.sf(3, 20, 0.05)), so at most 3 rejections are allowed.
        int weightedRejects = 0, unweightedRejects = 0;
        for (var k = 0; k < 20; k++)
        {
            var reference = CorrelatedNormal(300, 0.5, 500 + 2 * k);
            var weights = new double[reference.Length];
            for (var i = 0; i < reference.Length; i++)
            {
                reference[i][0] += 0.5;
                reference[i][1] += 0.25;
                weights[i] = Math.Exp(-0.5 * reference[i][0] * reference[i][0] + 0.5 * (reference[i][0] - 0.5) * (reference[i][0] - 0.5));
            }
            var sample = CorrelatedNormal(300, 0.5, 501 + 2 * k);
            var ones = Enumerable.Repeat(1.0, sample.Length).ToArray();
            if (EnergyDistance.PermutationTest(reference, sample, 99, k, xWeights: weights, yWeights: ones).PValue <= 0.05) weightedRejects++;
            if (EnergyDistance.PermutationTest(reference, sample, 99, k).PValue <= 0.05) unweightedRejects++;
        }
        Assert.True(weightedRejects <= 3, $"{weightedRejects} of 20 weighted tests rejected one law");
        // The shift of 0.5σ at 300 + 300 rows is seen by the unweighted test nearly always (the premise of the case).
        Assert.True(unweightedRejects >= 15, $"only {unweightedRejects} of 20 unweighted tests saw the shift");
    }

    [Fact]
    public void A_weighted_test_still_sees_a_broken_correlation()
    {
        // The weighted reference (signed weights: 5% of rows at −0.5) of a correlated pair against a sample whose
        // pair is independent: the energy test is consistent against any difference of laws (Székely & Rizzo 2004).
        var rng = new Xoshiro256StarStar(77, threadSafe: false);
        var reference = CorrelatedNormal(500, 0.8, 71);
        var weights = reference.Select(_ => rng.NextDouble() < 0.05 ? -0.5 : 1.0).ToArray();
        var sample = CorrelatedNormal(500, 0.0, 72);
        var r = EnergyDistance.PermutationTest(reference, sample, 199, 3, xWeights: weights, yWeights: Enumerable.Repeat(1.0, 500).ToArray());
        Assert.True(r.PValue <= 0.01, $"p = {r.PValue}");
    }

    /// <summary>Rows of a standard bivariate normal with correlation rho, seeded.</summary>
    private static double[][] CorrelatedNormal(int rows, double rho, int seed)
    {
        var rng = new Xoshiro256StarStar(seed, threadSafe: false);
        double c = Math.Sqrt(1 - rho * rho);
        var result = new double[rows][];
        for (int i = 0; i < rows; i++)
        {
            double a = Normal.Sample(rng, 0, 1), b = Normal.Sample(rng, 0, 1);
            result[i] = new[] { a, rho * a + c * b };
        }
        return result;
    }
}
