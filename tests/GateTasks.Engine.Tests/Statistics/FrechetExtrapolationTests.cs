using GateTasks.Engine.Statistics;
using MathNet.Numerics.Distributions;
using MathNet.Numerics.Random;
using Xunit.Abstractions;

namespace GateTasks.Engine.Tests.Statistics;

public class FrechetExtrapolationTests(ITestOutputHelper output)
{
    private const int Dimension = 5, Rows = 20_000, Blocks = 16, Batch = 4096;

    /// <summary>Lower Cholesky factor of Σ_ij = 0.5^|i−j| (unit variances, neighbours correlated 0.5).</summary>
    private static double[,] Mixing()
    {
        var sigma = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.Dense(Dimension, Dimension, (i, j) => Math.Pow(0.5, Math.Abs(i - j)));
        return sigma.Cholesky().Factor.ToArray();
    }

    /// <summary>Rows of shift + scale·L z, z standard normal from MathNet's seeded Xoshiro256**, streamed in batches.</summary>
    private static BlockedCovariance Draw(int seed, double shift, double scale, bool signedWeights = false)
    {
        var l = Mixing();
        var rng = new Xoshiro256StarStar(seed, threadSafe: false);
        var acc = new BlockedCovariance(Dimension, Blocks);
        var z = new double[Dimension];
        var columns = Enumerable.Range(0, Dimension).Select(_ => new double[Batch]).ToArray();
        var weights = new double[Batch];
        for (var start = 0; start < Rows; start += Batch)
        {
            var len = Math.Min(Batch, Rows - start);
            for (var i = 0; i < len; i++)
            {
                Normal.Samples(rng, z, 0, 1);
                for (var p = 0; p < Dimension; p++)
                {
                    var v = 0.0;
                    for (var q = 0; q <= p; q++) v += l[p, q] * z[q];
                    columns[p][i] = shift + scale * v;
                }
                // Weights independent of the features: a tenth at −0.5, the rest uniform on [0.5, 1.5].
                if (signedWeights) weights[i] = rng.NextDouble() < 0.1 ? -0.5 : 0.5 + rng.NextDouble();
            }
            acc.AddBatch(columns.Select(c => new ReadOnlyMemory<double>(c, 0, len)).ToArray(),
                signedWeights ? weights.AsSpan(0, len) : ReadOnlySpan<double>.Empty, start);
        }
        return acc;
    }

    private static (double Mean, double Sd) Summary(IReadOnlyList<double> v)
    {
        var mean = v.Average();
        return (mean, Math.Sqrt(v.Sum(x => (x - mean) * (x - mean)) / (v.Count - 1)));
    }

    [Fact]
    public void Equal_laws_raw_distance_is_biased_extrapolated_is_not()
    {
        const int replicas = 150;
        var raw = new double[replicas];
        var extrapolated = new double[replicas];
        var errors = new double[replicas];
        var covered = 0;
        for (var r = 0; r < replicas; r++)
        {
            var e = FrechetExtrapolation.Of(Draw(1000 + r, 0, 1), Draw(5000 + r, 0, 1));
            (raw[r], extrapolated[r], errors[r]) = (e.Raw, e.Extrapolated, e.StandardError);
            if (Math.Abs(e.Extrapolated) <= 1.96 * e.StandardError) covered++;
        }
        var (rawMean, rawSd) = Summary(raw);
        var (exMean, exSd) = Summary(extrapolated);
        var typicalError = Math.Sqrt(errors.Average(s => s * s));
        output.WriteLine(FormattableString.Invariant(
            $"raw {rawMean:G4} ± {rawSd:G3}; extrapolated {exMean:G4} ± {exSd:G3}; jackknife SE (rms) {typicalError:G3}; |FD∞| ≤ 1.96 SE in {covered}/{replicas}"));
        // The mean term alone has E|x̄₁ − x̄₂|² = Tr Σ (1/n₁ + 1/n₂) = 5 · 2/20 000 = 5e-4 under equal laws [expectation
        // of a squared difference of independent sample means]; the covariance term only adds to it. The raw FD sits
        // above that, many standard errors from zero.
        Assert.True(rawMean > 5e-4, $"raw mean {rawMean}");
        Assert.True(rawMean > 10 * rawSd / Math.Sqrt(replicas), $"raw mean {rawMean}, sd {rawSd}");
        // Chong & Forsyth 2020 (CVPR), Kansal et al. 2023 (Phys. Rev. D 107, 076017): the value extrapolated to 1/N → 0
        // is effectively unbiased; the true FD here is 0, so the replicas' mean is within 2 standard errors of 0.
        Assert.True(Math.Abs(exMean) <= 2 * exSd / Math.Sqrt(replicas), $"extrapolated mean {exMean}, sd {exSd}");
        // Efron & Tibshirani 1993 ch. 11: the delete-one-block jackknife SE estimates the estimator's spread, measured
        // here over independent replicas; within a factor 1.5. At equal laws the statistic is purely quadratic in the
        // estimation errors and the jackknife variance overstates its variance (Efron & Stein 1981, Ann. Stat. 9:586),
        // by a factor about 2 for a degenerate second-order statistic, so the SE sits near √2 times the spread
        // (measured 1.41 here; 1.37 over 300 replicas). The spread of this skewed estimate converges slowly (100
        // replicas gave 1.56), hence 150 replicas; the 95% intervals then cover 0 in (nearly) every replica.
        Assert.InRange(typicalError / exSd, 1 / 1.5, 1.5);
        Assert.True(covered >= 0.95 * replicas, $"|FD∞| ≤ 1.96 SE in {covered}/{replicas}");
    }

    [Fact]
    public void Signed_weights_equal_laws_extrapolate_to_zero()
    {
        // Weights independent of the features leave the weighted law that of the features, so the true FD is 0 and,
        // with Kish effective sizes in the abscissa, the extrapolated value is effectively unbiased (Chong & Forsyth
        // 2020; Kansal et al. 2023): the replicas' mean within 2 standard errors of 0, the raw value well above it.
        const int replicas = 12;
        var raw = new double[replicas];
        var extrapolated = new double[replicas];
        for (var r = 0; r < replicas; r++)
        {
            var e = FrechetExtrapolation.Of(Draw(3000 + r, 0, 1, signedWeights: true), Draw(9000 + r, 0, 1, signedWeights: true));
            (raw[r], extrapolated[r]) = (e.Raw, e.Extrapolated);
        }
        var (rawMean, rawSd) = Summary(raw);
        var (exMean, exSd) = Summary(extrapolated);
        output.WriteLine(FormattableString.Invariant($"raw {rawMean:G4} ± {rawSd:G3}; extrapolated {exMean:G4} ± {exSd:G3}"));
        Assert.True(rawMean > 5 * rawSd / Math.Sqrt(replicas), $"raw mean {rawMean}, sd {rawSd}");
        Assert.True(Math.Abs(exMean) <= 2 * exSd / Math.Sqrt(replicas), $"extrapolated mean {exMean}, sd {exSd}");
    }

    [Fact]
    public void Known_distance_is_recovered_without_its_bias()
    {
        // Sample law: mean shifted by 0.05 in each coordinate, covariance 1.1²·Σ. Σ₂ = c²Σ₁ commutes with Σ₁, so
        // (Σ₁^½ Σ₂ Σ₁^½)^½ = cΣ₁ and FD = 5·0.05² + (1 − c)²·Tr Σ₁ = 0.0125 + 0.01·5 = 0.0625 [Dowson & Landau 1982; hand-computed].
        const double truth = 0.0625;
        const int replicas = 40;
        var raw = new double[replicas];
        var extrapolated = new double[replicas];
        var errors = new double[replicas];
        var covered = 0;
        for (var r = 0; r < replicas; r++)
        {
            var e = FrechetExtrapolation.Of(Draw(2000 + r, 0, 1), Draw(7000 + r, 0.05, 1.1));
            (raw[r], extrapolated[r], errors[r]) = (e.Raw, e.Extrapolated, e.StandardError);
            if (Math.Abs(e.Extrapolated - truth) <= 1.96 * e.StandardError) covered++;
        }
        var (rawMean, rawSd) = Summary(raw);
        var (exMean, exSd) = Summary(extrapolated);
        output.WriteLine(FormattableString.Invariant(
            $"raw {rawMean:G4} ± {rawSd:G3}; extrapolated {exMean:G4} ± {exSd:G3}; jackknife SE (rms) {Math.Sqrt(errors.Average(s => s * s)):G3}; |FD∞ − FD| ≤ 1.96 SE in {covered}/{replicas}"));
        // Chong & Forsyth 2020; Kansal et al. 2023: the extrapolated value is effectively unbiased for the true FD.
        Assert.True(Math.Abs(exMean - truth) <= 2 * exSd / Math.Sqrt(replicas), $"extrapolated mean {exMean}, sd {exSd}");
        // Efron & Tibshirani 1993 ch. 11: away from equal laws the delete-one-block jackknife SE estimates the
        // estimator's spread, here measured directly over independent replicas: within a factor 1.5, and the 95%
        // intervals cover the true value in most replicas (at least 34 of 40; binomial(40, 0.95) gives fewer than 34
        // with probability 0.3%).
        Assert.InRange(Math.Sqrt(errors.Average(s => s * s)) / exSd, 1 / 1.5, 1.5);
        Assert.True(covered >= 34, $"|FD∞ − FD| ≤ 1.96 SE in {covered}/{replicas}");
    }

    [Fact]
    public void Nothing_to_compare_gives_nan_and_an_infinite_error()
    {
        // Documented behaviour (FrechetEstimate): no defined fit, no value (NaN) and an infinite standard error,
        // never an exception; and a sample that fills only some blocks still gives a value from the sizes it fills.
        var empty = new BlockedCovariance(2, 4);
        var full = new BlockedCovariance(2, 4);
        full.AddBatch([new double[] { 1, 2, 3, 4, 5, 6, 7, 8 }, new double[] { 2, 1, 4, 3, 6, 5, 8, 9 }], [], 0);
        var none = FrechetExtrapolation.Of(full, empty);
        Assert.True(double.IsNaN(none.Raw));
        Assert.True(double.IsNaN(none.Extrapolated));
        Assert.Equal(double.PositiveInfinity, none.StandardError);
        var partial = new BlockedCovariance(2, 4);
        partial.AddBatch([new double[] { 1, 3, 5 }, new double[] { 2, 2, 7 }], [], 0); // blocks 0, 1, 2; block 3 empty
        var some = FrechetExtrapolation.Of(full, partial);
        Assert.True(double.IsFinite(some.Raw) && double.IsFinite(some.Extrapolated));
        Assert.True(double.IsNaN(some.Points[0].Distance)); // the window of block 3 alone has no fit
    }

    /// <summary>The accumulation without block <paramref name="left"/>: its state with that block's numbers cut out.</summary>
    private static BlockedCovariance Without(BlockedCovariance acc, int left)
    {
        var per = CovarianceMoments.StateLength(acc.Dimension);
        var state = acc.State();
        var kept = new List<double> { acc.Dimension, acc.Blocks - 1 };
        for (var b = 0; b < acc.Blocks; b++)
            if (b != left) kept.AddRange(state.Skip(2 + 2 * b * per).Take(2 * per));
        var reduced = new BlockedCovariance(acc.Dimension, acc.Blocks - 1);
        Assert.True(reduced.Restore(kept.ToArray()));
        return reduced;
    }

    [Fact]
    public void Jackknife_reuses_windows_without_changing_the_values()
    {
        // Compares the program with itself: the standard error, whose leave-one-out values reuse the full set's windows
        // that do not bridge the left-out block, equals the jackknife of estimates made afresh on B − 1 blocks.
        var reference = Draw(41, 0, 1, signedWeights: true);
        var sample = Draw(42, 0.02, 1.05, signedWeights: true);
        var estimate = FrechetExtrapolation.Of(reference, sample);
        var afresh = Enumerable.Range(0, Blocks)
            .Select(b => FrechetExtrapolation.Of(Without(reference, b), Without(sample, b)).Extrapolated).ToArray();
        Assert.Equal(FrechetExtrapolation.JackknifeStandardError(afresh), estimate.StandardError, 1e-12 * estimate.StandardError);
    }

    [Fact]
    public void Jackknife_standard_error_of_a_mean_is_the_textbook_one()
    {
        // Efron & Tibshirani 1993, ch. 11: for the mean, the jackknife SE equals s/√n. Values 1..5: leave-one-out means
        // (14, 13, 12, 11, 10)/4; s = √2.5, n = 5 → SE = √0.5 [hand-computed].
        Assert.Equal(Math.Sqrt(0.5), FrechetExtrapolation.JackknifeStandardError([3.5, 3.25, 3.0, 2.75, 2.5]), 12);
        Assert.Equal(double.PositiveInfinity, FrechetExtrapolation.JackknifeStandardError([1.0, double.NaN, 2.0]));
    }
}
