using MathNet.Numerics.Distributions;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Equivalence and one-sided tolerance tests on an estimate with a known standard error.
/// <see cref="PValue(double, double, double, double)"/> is Schuirmann's (1987) two one-sided tests (TOST):
/// H0 "effect ≤ lower or effect ≥ upper" is rejected (equivalence shown) when p ≤ α, which is the same as the
/// (1 − 2α) interval lying inside (lower, upper). The normal forms treat the estimate as Gaussian; the
/// overloads with degrees of freedom use Student's t.
/// </summary>
internal static class EquivalenceTest
{
    /// <summary>The two TOST statistics t_L = (d − lower)/se and t_U = (d − upper)/se (Schuirmann 1987).</summary>
    internal static (double Lower, double Upper) Statistics(double d, double se, double lower, double upper)
    {
        RequireEstimate(d, se);
        RequireBounds(lower, upper);
        return ((d - lower) / se, (d - upper) / se);
    }

    /// <summary>TOST p-value, normal: max(P(Z ≥ t_L), P(Z ≤ t_U)) (Schuirmann 1987).</summary>
    internal static double PValue(double d, double se, double lower, double upper)
    {
        (double tLower, double tUpper) = Statistics(d, se, lower, upper);
        // Upper tail as the CDF at −t (symmetry) keeps small tail probabilities accurate.
        return Math.Max(Normal.CDF(0, 1, -tLower), Normal.CDF(0, 1, tUpper));
    }

    /// <summary>TOST p-value with Student's t on <paramref name="degreesOfFreedom"/> degrees of freedom (Schuirmann 1987).</summary>
    internal static double PValue(double d, double se, double lower, double upper, double degreesOfFreedom)
    {
        RequireDegreesOfFreedom(degreesOfFreedom);
        (double tLower, double tUpper) = Statistics(d, se, lower, upper);
        return Math.Max(StudentT.CDF(0, 1, degreesOfFreedom, -tLower), StudentT.CDF(0, 1, degreesOfFreedom, tUpper));
    }

    /// <summary>
    /// One-sided test of H0 "effect ≤ tolerance", normal: P(Z ≥ (estimate − tolerance)/se), the chance of an
    /// estimate this large or larger if the true effect were exactly the tolerance. A small p says the effect
    /// exceeds the tolerance. This is one of the two TOST halves.
    /// </summary>
    internal static double PValueAbove(double estimate, double se, double tolerance)
    {
        RequireEstimate(estimate, se);
        if (!double.IsFinite(tolerance))
            throw new ArgumentOutOfRangeException(nameof(tolerance), tolerance, "The tolerance must be finite.");
        return Normal.CDF(0, 1, -(estimate - tolerance) / se);
    }

    /// <summary>One-sided upper confidence bound estimate + z·se, z = Φ⁻¹(confidence) (normal).</summary>
    internal static double UpperBound(double estimate, double se, double confidence)
    {
        RequireEstimate(estimate, se);
        return estimate + OneSidedQuantile(confidence) * se;
    }

    /// <summary>One-sided lower confidence bound estimate − z·se, z = Φ⁻¹(confidence) (normal).</summary>
    internal static double LowerBound(double estimate, double se, double confidence)
    {
        RequireEstimate(estimate, se);
        return estimate - OneSidedQuantile(confidence) * se;
    }

    private static double OneSidedQuantile(double confidence)
    {
        if (!(confidence > 0 && confidence < 1))
            throw new ArgumentOutOfRangeException(nameof(confidence), confidence, "The confidence level must lie in (0, 1).");
        return Normal.InvCDF(0, 1, confidence);
    }

    private static void RequireEstimate(double estimate, double se)
    {
        if (!double.IsFinite(estimate))
            throw new ArgumentOutOfRangeException(nameof(estimate), estimate, "The estimate must be finite.");
        if (!(se > 0) || double.IsPositiveInfinity(se))
            throw new ArgumentOutOfRangeException(nameof(se), se, "The standard error must be positive and finite.");
    }

    private static void RequireBounds(double lower, double upper)
    {
        if (!double.IsFinite(lower) || !double.IsFinite(upper) || !(lower < upper))
            throw new ArgumentException(
                FormattableString.Invariant($"Equivalence bounds ({lower}, {upper}) must be finite with lower < upper."), nameof(lower));
    }

    private static void RequireDegreesOfFreedom(double degreesOfFreedom)
    {
        if (!(degreesOfFreedom > 0))
            throw new ArgumentOutOfRangeException(nameof(degreesOfFreedom), degreesOfFreedom, "Degrees of freedom must be positive.");
    }
}
