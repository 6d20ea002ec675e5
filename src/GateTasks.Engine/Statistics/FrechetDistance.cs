using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Fréchet distance between two Gaussian laws, the squared 2-Wasserstein distance between them (Dowson &amp; Landau
/// 1982, J. Multivar. Anal. 12:450; Olkin &amp; Pukelsheim 1982): FD = |μ₁ − μ₂|² + Tr(Σ₁ + Σ₂ − 2(Σ₁^½ Σ₂ Σ₁^½)^½).
/// Tr((Σ₁Σ₂)^½) of the usual formula (Heusel et al. 2017) equals Tr((Σ₁^½ Σ₂ Σ₁^½)^½), since Σ₁Σ₂ is similar to
/// the symmetric Σ₁^½ Σ₂ Σ₁^½; the symmetric form is used because it needs only symmetric eigendecompositions
/// (MathNet.Numerics), which are stable where the general square root of a non-symmetric product is not.
/// </summary>
internal static class FrechetDistance
{
    /// <summary>
    /// FD between two fits of the same d features; NaN when either fit is undefined (weights summing to zero).
    /// Only rounding can make the result negative (it is a squared distance), so it is clamped at 0.
    /// </summary>
    public static double Between(GaussianFit first, GaussianFit second)
    {
        if (first.Dimension != second.Dimension)
            throw new ArgumentException($"Fits of {first.Dimension} and {second.Dimension} features cannot be compared.", nameof(second));
        if (!first.IsDefined || !second.IsDefined) return double.NaN;
        var d = first.Dimension;
        var meanTerm = 0.0;
        for (var k = 0; k < d; k++)
        {
            var diff = first.Mean[k] - second.Mean[k];
            meanTerm += diff * diff;
        }
        var s1 = Symmetric(first.Covariance, d);
        var s2 = Symmetric(second.Covariance, d);
        return Math.Max(0.0, meanTerm + s1.Trace() + s2.Trace() - 2 * TraceOfRoot(s1, s2));
    }

    /// <summary>
    /// Tr((Σ₁^½ Σ₂ Σ₁^½)^½) = Σ√λ over the eigenvalues λ of the symmetric Σ₁^½ Σ₂ Σ₁^½. When Σ₁ is positive definite
    /// its Cholesky factor L (Σ₁ = LLᵀ) gives the same eigenvalues from LᵀΣ₂L (similar to Σ₁Σ₂ like the other), at one
    /// eigendecomposition instead of two; otherwise Σ₁^½ is formed from Σ₁'s eigendecomposition (<see cref="SquareRoot"/>).
    /// </summary>
    private static double TraceOfRoot(Matrix<double> s1, Matrix<double> s2)
    {
        Matrix<double>? inner = null;
        try
        {
            var l = s1.Cholesky().Factor;
            if (l.Diagonal().All(v => v > 0 && double.IsFinite(v)))
                inner = l.TransposeThisAndMultiply(s2 * l);
        }
        catch (ArgumentException)
        {
            // Not positive definite (MathNet's documented signal): singular, or not semi-definite with negative weights.
        }
        if (inner is null)
        {
            var root1 = SquareRoot(s1);
            inner = root1 * s2 * root1;
        }
        return SquareRootEigenvalues(Symmetrize(inner)).Sum();
    }

    /// <summary>
    /// Principal square root of a symmetric positive semi-definite matrix, V·diag(√λ)·Vᵀ from its symmetric
    /// eigendecomposition. Eigenvalues that are negative only through rounding (or, with negative event weights, an
    /// estimate that is not quite semi-definite) are clamped to 0: the root of the nearest semi-definite matrix.
    /// </summary>
    public static Matrix<double> SquareRoot(Matrix<double> symmetric)
    {
        var evd = symmetric.Evd(Symmetricity.Symmetric);
        var roots = evd.EigenValues.Select(l => Math.Sqrt(Math.Max(l.Real, 0.0))).ToArray();
        var v = evd.EigenVectors;
        return v * Matrix<double>.Build.DiagonalOfDiagonalArray(roots) * v.Transpose();
    }

    private static IEnumerable<double> SquareRootEigenvalues(Matrix<double> symmetric) =>
        symmetric.Evd(Symmetricity.Symmetric).EigenValues.Select(l => Math.Sqrt(Math.Max(l.Real, 0.0))); // clamped as in SquareRoot

    private static Matrix<double> Symmetric(double[] rowMajor, int d) =>
        Symmetrize(Matrix<double>.Build.Dense(d, d, (i, j) => rowMajor[i * d + j]));

    // Products of symmetric matrices are symmetric only up to rounding; the symmetric solver needs exact symmetry.
    private static Matrix<double> Symmetrize(Matrix<double> m) => (m + m.Transpose()) * 0.5;
}
