namespace GateTasks.Engine.Statistics;

/// <summary>
/// Dvoretzky–Kiefer–Wolfowitz (1956) inequality with Massart's (1990) tight constant:
/// P(sup |F_n − F| &gt; ε) ≤ 2 exp(−2nε²), so ε = √(ln(2/α)/(2n)) holds with probability ≥ 1 − α.
/// Valid for every n and every continuous F; for weighted samples n is the Kish effective count, which
/// makes the band approximate.
/// </summary>
internal static class DkwBound
{
    /// <summary>Half-width ε = √(ln(2/α)/(2n)) of the simultaneous band around one empirical CDF.</summary>
    internal static double Epsilon(double n, double alpha)
    {
        if (!(n > 0) || double.IsPositiveInfinity(n))
            throw new ArgumentOutOfRangeException(nameof(n), n, "The (effective) sample size must be positive and finite.");
        if (!(alpha > 0 && alpha < 1))
            throw new ArgumentOutOfRangeException(nameof(alpha), alpha, "alpha must lie in (0, 1).");
        return Math.Sqrt(Math.Log(2 / alpha) / (2 * n));
    }

    /// <summary>
    /// Half-width of a confidence band for the true Kolmogorov–Smirnov distance sup |F − G| around the observed
    /// sup |F_n1 − G_n2|: by the triangle inequality the two differ by at most ε1 + ε2, and with α split evenly
    /// (ε1 and ε2 each at α/2, union bound) both bands hold together with probability ≥ 1 − α.
    /// </summary>
    internal static double TwoSampleHalfWidth(double n1, double n2, double alpha)
    {
        if (!(alpha > 0 && alpha < 1))
            throw new ArgumentOutOfRangeException(nameof(alpha), alpha, "alpha must lie in (0, 1).");
        return Epsilon(n1, alpha / 2) + Epsilon(n2, alpha / 2);
    }
}
