namespace GateTasks.Engine.Statistics;

// Kolmogorov–Smirnov on histograms with the same bins (Smirnov 1939 applied to binned data). D is taken only
// at bin boundaries, so it is a lower bound of the unbinned D of the underlying samples and the p-value from
// the Kolmogorov (1933) limit is conservative (too large). Weighted contents, negative sums included, enter through
// the effective count of their CDF (CdfEffectiveCount).
internal static partial class KolmogorovSmirnov
{
    /// <summary>
    /// max |F1 − F2| over the upper bin boundaries of two histograms with the same bins. Contents are Σw per
    /// bin, of either sign (negative event weights); pass under/overflow as the first and last entries to include
    /// them. Each total must be positive. Binning makes this a lower bound of the unbinned D.
    /// </summary>
    internal static double BinnedDistance(ReadOnlySpan<double> sumW1, ReadOnlySpan<double> sumW2)
    {
        KernelPreconditions.RequireSameLength(sumW1.Length, sumW2.Length, nameof(sumW1), nameof(sumW2));
        double t1 = KernelPreconditions.RequireSignedContents(sumW1, nameof(sumW1));
        double t2 = KernelPreconditions.RequireSignedContents(sumW2, nameof(sumW2));
        double c1 = 0, c2 = 0, d = 0;
        for (int i = 0; i < sumW1.Length; i++)
        {
            c1 += sumW1[i];
            c2 += sumW2[i];
            d = Math.Max(d, Math.Abs(c1 / t1 - c2 / t2));
        }
        return d;
    }

    /// <summary>
    /// The effective number of events of a weighted histogram's normalised CDF, as held in its cells: at each inner
    /// boundary F = A/(A + B), with A and B the Σw below and above it and V_A, V_B their Σw², has the delta-method
    /// variance (B²·V_A + A²·V_B)/(A + B)⁴, which is F(1 − F)/n for n unit weights. The count returned is the
    /// smallest F(1 − F)/Var(F) over the boundaries where 0 &lt; F &lt; 1 — the size of an unweighted sample whose CDF
    /// is nowhere more precise — and Kish's (Σw)²/Σw² where no boundary qualifies. With weights that do not depend on
    /// the value it equals Kish's count; cells of either sign are allowed, only a total Σw ≤ 0 is refused.
    /// </summary>
    internal static double CdfEffectiveCount(ReadOnlySpan<double> sumW, ReadOnlySpan<double> sumW2)
    {
        KernelPreconditions.RequireSameLength(sumW.Length, sumW2.Length, nameof(sumW), nameof(sumW2));
        double total = KernelPreconditions.RequireSignedContents(sumW, nameof(sumW));
        KernelPreconditions.RequireFinite(sumW2, nameof(sumW2));
        double total2 = 0;
        for (int i = 0; i < sumW2.Length; i++) total2 += sumW2[i];
        double best = double.PositiveInfinity, a = 0, va = 0;
        for (int i = 0; i < sumW.Length - 1; i++)
        {
            a += sumW[i];
            va += sumW2[i];
            double f = a / total, b = total - a, vb = total2 - va;
            if (!(f > 0 && f < 1)) continue;
            double variance = (b * b * va + a * a * Math.Max(vb, 0)) / (total * total * total * total);
            if (variance > 0) best = Math.Min(best, f * (1 - f) / variance);
        }
        return double.IsPositiveInfinity(best) ? (total2 > 0 ? total * total / total2 : 0) : best;
    }

    /// <summary>
    /// Kolmogorov-limit p-value Q(√(n1·n2/(n1+n2))·D) at effective (Kish) counts n1, n2. For a binned D this
    /// is conservative: the true p-value of the unbinned samples is at most this.
    /// </summary>
    internal static double BinnedPValue(double d, double nEff1, double nEff2)
    {
        if (!(nEff1 > 0) || !(nEff2 > 0) || double.IsInfinity(nEff1) || double.IsInfinity(nEff2))
            throw new ArgumentOutOfRangeException(nameof(nEff1), "Effective counts must be positive and finite.");
        if (double.IsNaN(d) || d < 0)
            throw new ArgumentOutOfRangeException(nameof(d), "D must be non-negative.");
        return LimitSurvival(Lambda(d, nEff1, nEff2));
    }
}
