using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

public class FrechetDistanceTests
{
    private static GaussianFit Fit(double[] mean, double[] covariance) => new(mean, covariance, 1, 1, 1);

    [Fact]
    public void One_dimension_is_squared_mean_and_sd_differences()
    {
        // Dowson & Landau 1982 in one dimension: FD = (μ₁ − μ₂)² + (σ₁ − σ₂)²; μ = 1, σ = 2 against μ = −0.5, σ = 0.5
        // gives 1.5² + 1.5² = 4.5 [hand-computed].
        Assert.Equal(4.5, FrechetDistance.Between(Fit([1.0], [4.0]), Fit([-0.5], [0.25])), 12);
    }

    [Fact]
    public void One_dimension_from_streamed_data()
    {
        // {−1, 1}: mean 0, population variance 1; {2, 4, 6}: mean 4, population variance 8/3. FD = 16 + (1 − √(8/3))²
        // [hand-computed from Dowson & Landau 1982 in one dimension].
        var a = new BlockedCovariance(1, 2);
        a.AddBatch([new double[] { -1, 1 }], [], 0);
        var b = new BlockedCovariance(1, 2);
        b.AddBatch([new double[] { 2, 4, 6 }], [], 0);
        var expected = 16 + Math.Pow(1 - Math.Sqrt(8.0 / 3), 2);
        Assert.Equal(expected, FrechetDistance.Between(a.Fit(), b.Fit()), 12);
    }

    [Fact]
    public void Diagonal_covariances_add_per_coordinate()
    {
        // Commuting (diagonal) covariances: FD = Σ_k (μ₁k − μ₂k)² + (σ₁k − σ₂k)² [Dowson & Landau 1982; hand-computed]:
        // means (0, 1, 2) vs (1, 1, 0) give 1 + 0 + 4; sds (1, 2, 3) vs (2, 2, 1) give 1 + 0 + 4; total 10.
        var first = Fit([0, 1, 2], [1, 0, 0, 0, 4, 0, 0, 0, 9]);
        var second = Fit([1, 1, 0], [4, 0, 0, 0, 4, 0, 0, 0, 1]);
        Assert.Equal(10.0, FrechetDistance.Between(first, second), 12);
        Assert.Equal(10.0, FrechetDistance.Between(second, first), 12); // symmetric in its arguments (same closed form)
    }

    [Fact]
    public void Square_root_clamps_eigenvalues_negative_by_rounding()
    {
        // [[1, 1], [1, 1 − 1e-12]] has eigenvalues ≈ 2 and ≈ −5e-13: not semi-definite by a rounding-sized amount.
        // Clamped to 0 the root is that of [[1, 1], [1, 1]], i.e. [[1, 1], [1, 1]]/√2 [hand-computed], to about
        // √(5e-13) ≈ 7e-7 (a square root amplifies a tiny eigenvalue); without the clamp it would be NaN.
        var m = MathNet.Numerics.LinearAlgebra.Matrix<double>.Build.DenseOfArray(new double[,] { { 1, 1 }, { 1, 1 - 1e-12 } });
        var root = FrechetDistance.SquareRoot(m);
        foreach (var v in root.Enumerate()) Assert.Equal(1 / Math.Sqrt(2), v, 1e-6);
    }

    [Fact]
    public void Undefined_fits_give_nan()
    {
        // Documented behaviour: weights that cancel leave no Gaussian fit and no distance (NaN, not an exception).
        var cancelled = new BlockedCovariance(2, 2);
        cancelled.AddBatch([new double[] { 1, 2 }, new double[] { 3, 4 }], [1.0, -1.0], [0, 0]);
        Assert.False(cancelled.Fit().IsDefined);
        Assert.True(double.IsNaN(FrechetDistance.Between(cancelled.Fit(), Fit([0, 0], [1, 0, 0, 1]))));
    }

    [Theory]
    [InlineData("d3_unweighted", 1e-10)]
    [InlineData("d8_weighted", 1e-10)]
    [InlineData("d20_unweighted", 1e-10)]
    [InlineData("d6_nearly_singular", 1e-7)]
    [InlineData("d4_signed_weights", 1e-10)]
    public void Distance_between_numpy_fits_matches_scipy_sqrtm(string name, double relative)
    {
        var c = FrechetFixture.Case(name);
        var d = c.GetProperty("d").GetInt32();
        var first = new GaussianFit(c.Numbers("mean1"), c.Numbers("cov1"), 1, 1, 1);
        var second = new GaussianFit(c.Numbers("mean2"), c.Numbers("cov2"), 1, 1, 1);
        // scipy 1.10.1 / numpy 1.24.2: diff @ diff + trace(cov1 + cov2 − 2·scipy.linalg.sqrtm(cov1 @ cov2).real), and the
        // symmetric form with sqrtm(r1 @ cov2 @ r1), r1 = sqrtm(cov1) (tests/fixtures/scipy/frechet.json). The two scipy
        // values differ by 2e-8 relative on the nearly singular case, hence its looser tolerance.
        var fd = FrechetDistance.Between(first, second);
        ScipyFixture.Near(c.GetProperty("fd").GetDouble(), fd, relative);
        ScipyFixture.Near(c.GetProperty("fd_symmetric").GetDouble(), fd, relative);
        Assert.Equal(d, first.Dimension);
    }

    [Theory]
    [InlineData("d3_unweighted", 1e-9)]
    [InlineData("d8_weighted", 1e-9)]
    [InlineData("d20_unweighted", 1e-9)]
    [InlineData("d6_nearly_singular", 1e-6)]
    [InlineData("d4_signed_weights", 1e-9)]
    public void Distance_between_streamed_fits_matches_scipy(string name, double relative)
    {
        var c = FrechetFixture.Case(name);
        var (x1, w1) = FrechetFixture.Side(c, 1);
        var (x2, w2) = FrechetFixture.Side(c, 2);
        var first = FrechetFixture.Accumulate(x1, w1, 4, 97).Fit();
        var second = FrechetFixture.Accumulate(x2, w2, 4, 64).Fit();
        // scipy 1.10.1: the same fd as above, from numpy's fits of the raw rows (tests/fixtures/scipy/frechet.json).
        ScipyFixture.Near(c.GetProperty("fd").GetDouble(), FrechetDistance.Between(first, second), relative);
    }
}
