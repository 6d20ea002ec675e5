using System.Text.Json;
using GateTasks.Engine.Statistics;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;
using Xunit.Abstractions;
using static GateTasks.Engine.Tests.Statistics.ScipyFixture;

namespace GateTasks.Engine.Tests.Statistics;

public class UnbiasedKernelDistanceTests(ITestOutputHelper output)
{
    // tests/fixtures/scipy/kernel_distance.json, written by tests/fixtures/scipy/make_kernel_distance_fixtures.py with
    // Debian's numpy 1.24.2 from the full n×n kernel matrices (no feature map); each case records its exact expression.
    private static readonly Lazy<JsonDocument> Fixture = new(() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "scipy", "kernel_distance.json"))));

    private static JsonElement KernelCase(string name) =>
        Fixture.Value.RootElement.GetProperty("cases").EnumerateArray().First(c => c.GetProperty("name").GetString() == name);

    private static double[][] Rows(JsonElement c, string property) =>
        c.GetProperty(property).EnumerateArray().Select(r => r.EnumerateArray().Select(v => v.GetDouble()).ToArray()).ToArray();

    private static double[]? Weights(JsonElement c, string property) =>
        c.TryGetProperty(property, out JsonElement w) ? w.EnumerateArray().Select(v => v.GetDouble()).ToArray() : null;

    private static CubicKernelFeatureSums Sums(double[][] rows, double[]? weights)
    {
        var sums = new CubicKernelFeatureSums(rows[0].Length);
        for (int i = 0; i < rows.Length; i++) sums.Add(rows[i], weights?[i] ?? 1.0);
        return sums;
    }

    [Fact]
    public void FixtureRecordsTheNumpyVersion()
    {
        Assert.Equal("1.24.2", Fixture.Value.RootElement.GetProperty("numpy").GetString());
        Assert.Equal(4, Fixture.Value.RootElement.GetProperty("cases").GetArrayLength());
    }

    [Theory]
    [InlineData("d2_pearson_half_vs_permuted")]
    [InlineData("d5_same_law")]
    [InlineData("d12_small_shift")]
    [InlineData("d5_weighted_negative")]
    public void FullSampleEstimateAgreesWithNumpyKernelMatrices(string name)
    {
        var c = KernelCase(name);
        double[][] x = Rows(c, "x"), y = Rows(c, "y");
        double[]? wx = Weights(c, "wx"), wy = Weights(c, "wy");
        KernelDistanceEstimate e = UnbiasedKernelDistance.Estimate(x, wx, y, wy, blocks: 10, seed: 3);
        // numpy 1.24.2, kernel_distance.json/<name>/mmd2: the weighted unbiased MMD² from the full kernel matrices
        // (Gretton et al. 2012 Lemma 6 with the kernel of Kansal et al. 2023), expression in the case's "call".
        Near(c.Double("mmd2"), e.FullSample, 1e-10);
        Assert.True(e.FromFeatureMap);
        CubicKernelFeatureSums sx = Sums(x, wx), sy = Sums(y, wy);
        // numpy 1.24.2, the three terms of the same expression: within x, within y, across.
        Near(c.Double("kxx"), sx.DistinctPairSum() / sx.DistinctPairWeight, 1e-12);
        Near(c.Double("kyy"), sy.DistinctPairSum() / sy.DistinctPairWeight, 1e-12);
        Near(c.Double("kxy"), sx.PairSum(sy) / (sx.WeightSum * sy.WeightSum), 1e-12);
        Near(c.Double("mmd2"), UnbiasedKernelDistance.FromSums(sx, sy), 1e-10);
    }

    [Theory]
    [InlineData("d2_pearson_half_vs_permuted")]
    [InlineData("d5_same_law")]
    [InlineData("d12_small_shift")]
    public void UnitWeightsGiveLemmaSixsUnweightedEstimator(string name)
    {
        var c = KernelCase(name);
        double[][] x = Rows(c, "x"), y = Rows(c, "y");
        double[] ones = Enumerable.Repeat(1.0, x.Length).ToArray(), onesY = Enumerable.Repeat(1.0, y.Length).ToArray();
        double weighted = UnbiasedKernelDistance.Estimate(x, ones, y, onesY).FullSample;
        // numpy 1.24.2, kernel_distance.json/<name>/mmd2_lemma6: Σ_{i≠j} k/(n(n−1)) + Σ_{i≠j} k/(m(m−1)) − 2 mean k(x, y)
        // (Gretton et al. 2012 Lemma 6), expression in "call_lemma6".
        Near(c.Double("mmd2_lemma6"), weighted, 1e-10);
        // Program against itself: explicit unit weights and no weights run the same arithmetic (w·v = v exactly).
        Assert.Equal(UnbiasedKernelDistance.Estimate(x, null, y, null).FullSample, weighted);
    }

    [Theory]
    [InlineData("d5_same_law")]
    [InlineData("d5_weighted_negative")]
    public void DirectSumsAgreeWithNumpyKernelMatrices(string name)
    {
        // The estimator the wide-row fallback applies to its sub-blocks, here on all rows of a fixture case.
        var c = KernelCase(name);
        double direct = UnbiasedKernelDistance.DirectEstimate(Rows(c, "x"), Weights(c, "wx"), Rows(c, "y"), Weights(c, "wy"));
        // numpy 1.24.2, kernel_distance.json/<name>/mmd2, expression in "call".
        Near(c.Double("mmd2"), direct, 1e-10);
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    [InlineData(7)]
    [InlineData(20)]
    public void FeatureMapPairSumIsTheKernel(int d)
    {
        // Definition check: the feature-map inner product of two one-row sets against k(a, b) = (a·b/d + 1)³ evaluated
        // directly (the multinomial expansion, Schölkopf & Smola 2002 §2.1); weights enter as a product.
        var random = new Xoshiro256StarStar(40 + d, threadSafe: false);
        for (int trial = 0; trial < 20; trial++)
        {
            double[] a = Normal.Samples(random, 0, 1.5).Take(d).ToArray(), b = Normal.Samples(random, 0, 1.5).Take(d).ToArray();
            double dot = a.Zip(b, (p, q) => p * q).Sum();
            double expected = Math.Pow(dot / d + 1, 3);
            var sa = new CubicKernelFeatureSums(d);
            var sb = new CubicKernelFeatureSums(d);
            sa.Add(a, 0.7);
            sb.Add(b, -1.3);
            Near(expected, CubicKernelFeatureSums.Kernel(a, b), 1e-13, 1e-13);
            Near(0.7 * -1.3 * expected, sa.PairSum(sb), 1e-12, 1e-12);
            Near(0.49 * Math.Pow(a.Sum(v => v * v) / d + 1, 3), sa.SelfKernelSum, 1e-13);
            Near(0, sa.DistinctPairSum(), 0, 1e-9 * sa.SelfKernelSum);
        }
        Assert.Equal((d + 3) * (d + 2) * (d + 1) / 6, CubicKernelFeatureSums.FeatureCount(d));
    }

    [Fact]
    public void ShardsMergeToTheOnePassSums()
    {
        // Program against itself: sums filled in three shards and merged give the one-pass estimate (to rounding).
        var c = KernelCase("d5_weighted_negative");
        double[][] x = Rows(c, "x"), y = Rows(c, "y");
        double[] wx = Weights(c, "wx")!, wy = Weights(c, "wy")!;
        var merged = new CubicKernelFeatureSums(5);
        foreach (var (start, end) in new[] { (0, 100), (100, 101), (101, 400) })
            merged.Merge(Sums(x[start..end], wx[start..end]));
        Assert.Equal(400, merged.Count);
        Near(UnbiasedKernelDistance.FromSums(Sums(x, wx), Sums(y, wy)), UnbiasedKernelDistance.FromSums(merged, Sums(y, wy)), 1e-12);
    }

    [Fact]
    public void BlocksDependOnTheSeedAndTheFullSampleDoesNot()
    {
        // Program against itself: the full-sample estimate is one number whatever the block assignment; the blocks are
        // reproducible for a seed and differ between seeds.
        var c = KernelCase("d12_small_shift");
        double[][] x = Rows(c, "x"), y = Rows(c, "y");
        KernelDistanceEstimate a = UnbiasedKernelDistance.Estimate(x, null, y, null, 10, 5);
        KernelDistanceEstimate again = UnbiasedKernelDistance.Estimate(x, null, y, null, 10, 5);
        KernelDistanceEstimate other = UnbiasedKernelDistance.Estimate(x, null, y, null, 10, 6);
        Assert.Equal(a.BlockEstimates, again.BlockEstimates);
        Assert.Equal(a.FullSample, again.FullSample);
        Assert.NotEqual(a.BlockEstimates, other.BlockEstimates);
        Near(a.FullSample, other.FullSample, 1e-12);
        Assert.Equal(10, a.BlockEstimates.Count);
        Near(a.BlockEstimates.Average(), a.BlockMean, 1e-15);
        double sd = Math.Sqrt(a.BlockEstimates.Sum(e => (e - a.BlockMean) * (e - a.BlockMean)) / 9);
        Near(sd, a.BlockStandardDeviation, 1e-12);
        Near(sd / Math.Sqrt(10), a.BlockStandardError, 1e-12);
    }

    [Fact]
    public void SameLawScattersAboutZeroAndBlockErrorsMatchTheReplicas()
    {
        // 40 replicas of two independent samples of one law: 5-D normal, every correlation 0.3, 20 000 rows a side.
        const int replicas = 40, rows = 20_000, d = 5, blocks = 10;
        var random = new Xoshiro256StarStar(2026, threadSafe: false);
        var full = new double[replicas];
        var blockMeans = new double[replicas];
        var blockErrors = new double[replicas];
        var blockSds = new double[replicas];
        for (int r = 0; r < replicas; r++)
        {
            KernelDistanceEstimate e = UnbiasedKernelDistance.Estimate(
                EquiCorrelated(random, rows, d, 0.3), null, EquiCorrelated(random, rows, d, 0.3), null, blocks, r);
            (full[r], blockMeans[r], blockErrors[r], blockSds[r]) = (e.FullSample, e.BlockMean, e.BlockStandardError, e.BlockStandardDeviation);
        }
        double fullMean = full.Average(), fullSd = Sd(full);
        output.WriteLine($"null d=5 n=20000: mean full {fullMean:G4}, replica SD full {fullSd:G4}, replica SD block mean {Sd(blockMeans):G4}, " +
                         $"mean block SE {blockErrors.Average():G4}, mean block SD/B {blockSds.Average() / blocks:G4}");
        // Unbiasedness, Gretton et al. (2012) Lemma 6: E MMD²ᵤ = 0 when the laws agree; mean of 40 replicas within 2 SE.
        Assert.InRange(fullMean, -2 * fullSd / Math.Sqrt(replicas), 2 * fullSd / Math.Sqrt(replicas));
        // The block means too (each block is an unbiased estimate); at 3 SE because the kernel's heavy tails make two
        // checks at 2 SE on one seed too likely to trip by chance (a 300-replica run put this mean at 0.5 SE).
        Assert.InRange(blockMeans.Average(), -3 * Sd(blockMeans) / Math.Sqrt(replicas), 3 * Sd(blockMeans) / Math.Sqrt(replicas));
        // Disjoint blocks are independent, so SD/√B is the standard error of the block mean: within a factor 1.5 of
        // the spread of the block means over the replicas.
        Assert.InRange(blockErrors.Average() / Sd(blockMeans), 1 / 1.5, 1.5);
        // Under equal laws MMD²ᵤ is a degenerate U-statistic with variance of order 1/n² (Gretton et al. 2012 §5.3,
        // Thm. 12), so the full-sample spread is about the block SD / B, not SD/√B: check both by the replicas.
        Assert.InRange(blockSds.Average() / blocks / fullSd, 1 / 1.5, 1.5);
        Assert.True(blockErrors.Average() > 2 * fullSd,
            $"block SE {blockErrors.Average():G4} should overstate the full-sample spread {fullSd:G4} under equal laws");
    }

    [Fact]
    public void PermutedFeatureIsManyStandardErrorsAboveZero()
    {
        // A pair with Pearson 0.5 against the same law with the second feature permuted across rows (marginals exact,
        // correlation gone), 50 000 rows a side.
        const int rows = 50_000;
        var random = new Xoshiro256StarStar(77, threadSafe: false);
        KernelDistanceEstimate e = UnbiasedKernelDistance.Estimate(
            EquiCorrelated(random, rows, 2, 0.5), null, Permuted(random, EquiCorrelated(random, rows, 2, 0.5)), null, 10, 1);
        double ratio = e.FullSample / e.BlockStandardError;
        output.WriteLine($"Pearson 0.5 vs permuted, 50000 rows a side: MMD² {e.FullSample:G4} ± {e.BlockStandardError:G4} (block SE), ratio {ratio:F1}");
        // Consistency of the test (Gretton et al. 2012 Thm. 10/Cor. 11: MMD² > 0 for distinct laws with a characteristic
        // kernel; the cubic kernel sees the mixed moment E[x₁x₂] = 0.5 against 0): at this size far above its error.
        Assert.True(ratio > 20, $"MMD² / block SE = {ratio:F1}");
    }

    [Fact]
    public void UnderADifferenceBlockErrorIsTheFullSamplesError()
    {
        // 30 replicas of the permuted-feature pair at 20 000 rows a side: a non-degenerate U-statistic, variance of order
        // 1/n (Hoeffding 1948; Serfling 1980 §5.5), so the full-sample spread is about block SD/√B.
        const int replicas = 30, rows = 20_000;
        var random = new Xoshiro256StarStar(91, threadSafe: false);
        var full = new double[replicas];
        var errors = new double[replicas];
        for (int r = 0; r < replicas; r++)
        {
            KernelDistanceEstimate e = UnbiasedKernelDistance.Estimate(
                EquiCorrelated(random, rows, 2, 0.5), null, Permuted(random, EquiCorrelated(random, rows, 2, 0.5)), null, 10, r);
            (full[r], errors[r]) = (e.FullSample, e.BlockStandardError);
        }
        output.WriteLine($"alternative d=2 n=20000: mean full {full.Average():G4}, replica SD {Sd(full):G4}, mean block SE {errors.Average():G4}");
        Assert.InRange(errors.Average() / Sd(full), 1 / 1.5, 1.5);
    }

    [Fact]
    public void WideRowsFallBackToUnbiasedSubBlocks()
    {
        // 41 features, beyond the feature map: the fallback averages direct estimates over sub-blocks. Unbiasedness
        // (Gretton et al. 2012 Lemma 6 on each sub-block): equal laws scatter about 0 over 20 replicas; a shifted law
        // is far above its block standard error.
        const int d = 41, rows = 4_000, replicas = 20;
        var random = new Xoshiro256StarStar(5, threadSafe: false);
        var nulls = new double[replicas];
        KernelDistanceEstimate? last = null;
        for (int r = 0; r < replicas; r++)
        {
            last = UnbiasedKernelDistance.Estimate(EquiCorrelated(random, rows, d, 0.2), null, EquiCorrelated(random, rows, d, 0.2), null, 10, r);
            nulls[r] = last.FullSample;
        }
        Assert.False(last!.FromFeatureMap);
        Assert.Equal(UnbiasedKernelDistance.DirectMultiplyAddsPerRow / d, last.SubBlockRows);
        Assert.Equal(last.BlockMean, last.FullSample);
        Assert.InRange(nulls.Average(), -2 * Sd(nulls) / Math.Sqrt(replicas), 2 * Sd(nulls) / Math.Sqrt(replicas));
        double[][] shifted = EquiCorrelated(random, rows, d, 0.2);
        foreach (double[] row in shifted) row[0] += 0.5;
        KernelDistanceEstimate e = UnbiasedKernelDistance.Estimate(EquiCorrelated(random, rows, d, 0.2), null, shifted, null, 10, 1);
        output.WriteLine($"d=41 fallback: null mean {nulls.Average():G3} (SD {Sd(nulls):G3}); shift 0.5 in one feature: {e.FullSample:G3} ± {e.BlockStandardError:G3}");
        Assert.True(e.FullSample > 5 * e.BlockStandardError, $"{e.FullSample} ± {e.BlockStandardError}");
    }

    [Fact]
    public void UndefinedOrMalformedInputIsRefused()
    {
        // Documented behaviour (XML docs of UnbiasedKernelDistance): each refusal says what is wrong.
        double[][] x = EquiCorrelated(new Xoshiro256StarStar(1, threadSafe: false), 40, 3, 0.1);
        Assert.Contains("at least 20 rows a side", Assert.Throws<ArgumentException>(() => UnbiasedKernelDistance.Estimate(x, null, x[..19], null)).Message);
        Assert.Throws<ArgumentOutOfRangeException>(() => UnbiasedKernelDistance.Estimate(x, null, x, null, blocks: 1));
        Assert.Contains("39 weights for 40 rows", Assert.Throws<ArgumentException>(() => UnbiasedKernelDistance.Estimate(x, new double[39], x, null)).Message);
        double[][] ragged = x.Select(r => r.ToArray()).ToArray();
        ragged[7] = [1, 2];
        Assert.Contains("y[7] has 2 features; expected 3", Assert.Throws<ArgumentException>(() => UnbiasedKernelDistance.Estimate(x, null, ragged, null)).Message);
        double[][] nan = x.Select(r => r.ToArray()).ToArray();
        nan[3][1] = double.NaN;
        Assert.Contains("x[3]", Assert.Throws<ArgumentException>(() => UnbiasedKernelDistance.Estimate(nan, null, x, null)).Message);
        // Negative weights dominating a block: the weighted means are undefined, never a number.
        double[] negative = Enumerable.Repeat(-1.0, 40).ToArray();
        Assert.Contains("must be positive", Assert.Throws<ArgumentException>(() => UnbiasedKernelDistance.Estimate(x, negative, x, null)).Message);
    }

    private static double Sd(double[] values)
    {
        double mean = values.Average();
        return Math.Sqrt(values.Sum(v => (v - mean) * (v - mean)) / (values.Length - 1));
    }

    /// <summary>Rows of a d-dimensional normal with unit variances and every correlation ρ: √ρ·g + √(1−ρ)·zᵢ.</summary>
    private static double[][] EquiCorrelated(System.Random random, int rows, int d, double rho)
    {
        var result = new double[rows][];
        double shared = Math.Sqrt(rho), own = Math.Sqrt(1 - rho);
        var z = new double[d + 1];
        for (int i = 0; i < rows; i++)
        {
            Normal.Samples(random, z, 0, 1);
            var row = new double[d];
            for (int f = 0; f < d; f++) row[f] = shared * z[d] + own * z[f];
            result[i] = row;
        }
        return result;
    }

    /// <summary>The rows with their last feature permuted across rows (Fisher–Yates through MathNet's shuffle).</summary>
    private static double[][] Permuted(System.Random random, double[][] rows)
    {
        int last = rows[0].Length - 1;
        double[] column = rows.Select(r => r[last]).ToArray();
        random.Shuffle(column);
        for (int i = 0; i < rows.Length; i++) rows[i][last] = column[i];
        return rows;
    }
}
