namespace GateTasks.Engine.Statistics;

// Kolmogorov–Smirnov on histograms with the same bins (Smirnov 1939 applied to binned data). D is taken only
// at bin boundaries, so it is a lower bound of the unbinned D of the underlying samples and the p-value from
// the Kolmogorov (1933) limit is conservative (too large). Weighted contents enter through Kish (1965)
// effective counts.
internal static partial class KolmogorovSmirnov
{
    /// <summary>
    /// max |F1 − F2| over the upper bin boundaries of two histograms with the same bins. Contents are Σw per
    /// bin; pass under/overflow as the first and last entries to include them. Binning makes this a lower
    /// bound of the unbinned D.
    /// </summary>
    internal static double BinnedDistance(ReadOnlySpan<double> sumW1, ReadOnlySpan<double> sumW2)
    {
        KernelPreconditions.RequireSameLength(sumW1.Length, sumW2.Length, nameof(sumW1), nameof(sumW2));
        double t1 = KernelPreconditions.RequireContents(sumW1, nameof(sumW1));
        double t2 = KernelPreconditions.RequireContents(sumW2, nameof(sumW2));
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
