using MathNet.Numerics;
using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// The ratio of two Poisson means judged by conditioning on the sum of the two counts: given N = k₁ + k₂, k₁ is
/// binomial with success probability π = μ₁/(μ₁ + μ₂), so a hypothesis about μ₁/μ₂ is a hypothesis about π and both
/// its tail probabilities and its confidence bounds are exact binomial ones (Przyborowski &amp; Wilenski 1940; the
/// "Z_Bi" test of Cousins, Linnemann &amp; Tucker 2008, NIM A 595, 480, §3). Counts may be non-integer (effective
/// counts of weighted samples); the binomial tails are then read from the regularized incomplete beta function,
/// its continuous extension in k, an approximation.
/// </summary>
internal static class PoissonRatio
{
    /// <summary>P(X ≥ k) for X ~ Binomial(n, π): I_π(k, n − k + 1); 1 for k ≤ 0.</summary>
    public static double UpperTail(double k, double n, double pi)
    {
        Require(k, n, pi);
        if (k <= 0) return 1;
        if (pi <= 0) return 0;
        if (pi >= 1) return 1;
        return Math.Clamp(SpecialFunctions.BetaRegularized(k, n - k + 1, pi), 0, 1);
    }

    /// <summary>P(X ≤ k) for X ~ Binomial(n, π): I_{1−π}(n − k, k + 1); 1 for k ≥ n.</summary>
    public static double LowerTail(double k, double n, double pi)
    {
        Require(k, n, pi);
        if (k >= n) return 1;
        if (pi <= 0) return 1;
        if (pi >= 1) return 0;
        return Math.Clamp(SpecialFunctions.BetaRegularized(n - k, k + 1, 1 - pi), 0, 1);
    }

    /// <summary>
    /// One-sided Clopper &amp; Pearson (1934) bounds on π at <paramref name="confidence"/> each:
    /// lower = B⁻¹(1 − c; k, n − k + 1) (0 at k ≤ 0), upper = B⁻¹(c; k + 1, n − k) (1 at k ≥ n).
    /// </summary>
    public static (double Lower, double Upper) Bounds(double k, double n, double confidence)
    {
        Require(k, n, 0.5);
        if (!(confidence > 0 && confidence < 1))
            throw new ArgumentOutOfRangeException(nameof(confidence), confidence, "The confidence level must lie in (0, 1).");
        var lower = k <= 0 ? 0.0 : Beta.InvCDF(k, n - k + 1, 1 - confidence);
        var upper = k >= n ? 1.0 : Beta.InvCDF(k + 1, n - k, confidence);
        return (lower, upper);
    }

    /// <summary>
    /// π for a ratio ρ = (μ₁/s₁)/(μ₂/s₂) of the two means each per unit of its sample's size s:
    /// π = ρ·s₁/(ρ·s₁ + s₂).
    /// </summary>
    public static double Share(double ratio, double size1, double size2) => ratio * size1 / (ratio * size1 + size2);

    /// <summary>The inverse of <see cref="Share"/>: ρ = π·s₂/((1 − π)·s₁); +∞ at π = 1.</summary>
    public static double Ratio(double share, double size1, double size2) =>
        share >= 1 ? double.PositiveInfinity : share * size2 / ((1 - share) * size1);

    private static void Require(double k, double n, double pi)
    {
        if (!double.IsFinite(k) || !double.IsFinite(n) || !(n > 0) || k < 0 || k > n)
            throw new ArgumentOutOfRangeException(nameof(k), k, $"Counts must be finite with 0 ≤ k ≤ n and n > 0 (n = {n}).");
        if (!(pi >= 0 && pi <= 1))
            throw new ArgumentOutOfRangeException(nameof(pi), pi, "A binomial probability must lie in [0, 1].");
    }
}
