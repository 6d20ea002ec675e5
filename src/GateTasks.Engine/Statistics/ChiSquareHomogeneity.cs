using MathNet.Numerics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// χ² test that two histograms with the same bins come from one distribution, for unweighted and weighted
/// entries (Gagunashvili 2006, physics/0605123; Gagunashvili 2010, NIM A 614:287). Totals are not compared,
/// only shapes. Bins empty in both histograms are skipped; ndf = bins used − 1. With fewer than two bins used
/// there is no shape to test and the result is X² = 0, ndf = 0, p = 1.
/// </summary>
internal static class ChiSquareHomogeneity
{
    /// <summary>Two unweighted histograms: X² = (1/(MN)) Σ (M n_i − N m_i)²/(n_i + m_i).</summary>
    internal static ChiSquareResult Unweighted(ReadOnlySpan<double> n, ReadOnlySpan<double> m)
    {
        KernelPreconditions.RequireSameLength(n.Length, m.Length, nameof(n), nameof(m));
        double bigN = KernelPreconditions.RequireContents(n, nameof(n));
        double bigM = KernelPreconditions.RequireContents(m, nameof(m));
        double sum = 0;
        int used = 0;
        for (int i = 0; i < n.Length; i++)
        {
            double total = n[i] + m[i];
            if (total == 0)
                continue;
            used++;
            double r = bigM * n[i] - bigN * m[i];
            sum += r * r / total;
        }
        return Result(sum / (bigM * bigN), used);
    }

    /// <summary>
    /// Two weighted histograms, w = Σweights and s² = Σweights² per bin:
    /// X² = Σ (W₁w₂ᵢ − W₂w₁ᵢ)²/(W₁²s₂ᵢ² + W₂²s₁ᵢ²) (Gagunashvili 2010).
    /// </summary>
    internal static ChiSquareResult Weighted(ReadOnlySpan<double> w1, ReadOnlySpan<double> s1Sq,
        ReadOnlySpan<double> w2, ReadOnlySpan<double> s2Sq)
    {
        KernelPreconditions.RequireSameLength(w1.Length, s1Sq.Length, nameof(w1), nameof(s1Sq));
        KernelPreconditions.RequireSameLength(w1.Length, w2.Length, nameof(w1), nameof(w2));
        KernelPreconditions.RequireSameLength(w2.Length, s2Sq.Length, nameof(w2), nameof(s2Sq));
        double bigW1 = KernelPreconditions.RequireContents(w1, nameof(w1));
        double bigW2 = KernelPreconditions.RequireContents(w2, nameof(w2));
        RequireVariances(s1Sq, nameof(s1Sq));
        RequireVariances(s2Sq, nameof(s2Sq));
        double sum = 0;
        int used = 0;
        for (int i = 0; i < w1.Length; i++)
        {
            if (w1[i] == 0 && w2[i] == 0)
                continue;
            double denominator = bigW1 * bigW1 * s2Sq[i] + bigW2 * bigW2 * s1Sq[i];
            if (denominator <= 0)
                throw new ArgumentException($"Bin {i} has content but zero variance in both histograms.", nameof(s1Sq));
            used++;
            double r = bigW1 * w2[i] - bigW2 * w1[i];
            sum += r * r / denominator;
        }
        return Result(sum, used);
    }

    /// <summary>
    /// Unweighted histogram n (total N) against weighted histogram w with variances s² (total W), using the
    /// maximum-likelihood bin probabilities of Gagunashvili (2006):
    /// p̂ᵢ = [W wᵢ − N sᵢ² + √((W wᵢ − N sᵢ²)² + 4 W² sᵢ² nᵢ)]/(2W²),
    /// X² = Σ (nᵢ − N p̂ᵢ)²/(N p̂ᵢ) + Σ (wᵢ − W p̂ᵢ)²/sᵢ².
    /// A weighted bin with zero content and zero variance next to unweighted entries is given the variance
    /// of one event of the histogram's mean weight, Σs²/W (our convention: the method needs sᵢ² &gt; 0).
    /// </summary>
    internal static ChiSquareResult UnweightedWeighted(ReadOnlySpan<double> n, ReadOnlySpan<double> w, ReadOnlySpan<double> sSq)
    {
        KernelPreconditions.RequireSameLength(n.Length, w.Length, nameof(n), nameof(w));
        KernelPreconditions.RequireSameLength(w.Length, sSq.Length, nameof(w), nameof(sSq));
        double bigN = KernelPreconditions.RequireContents(n, nameof(n));
        double bigW = KernelPreconditions.RequireContents(w, nameof(w));
        RequireVariances(sSq, nameof(sSq));
        double totalVariance = 0;
        foreach (double v in sSq) totalVariance += v;
        double oneEventVariance = totalVariance / bigW;

        double sum = 0;
        int used = 0;
        for (int i = 0; i < n.Length; i++)
        {
            if (n[i] == 0 && w[i] == 0)
                continue;
            used++;
            double s2 = sSq[i] > 0 ? sSq[i] : oneEventVariance;
            double a = bigW * w[i] - bigN * s2;
            double p = (a + Math.Sqrt(a * a + 4 * bigW * bigW * s2 * n[i])) / (2 * bigW * bigW);
            double rn = n[i] - bigN * p;
            double rw = w[i] - bigW * p;
            sum += rn * rn / (bigN * p) + rw * rw / s2;
        }
        return Result(sum, used);
    }

    private static ChiSquareResult Result(double chiSquare, int usedBins)
    {
        int ndf = usedBins - 1;
        if (ndf < 1)
            return new ChiSquareResult(0.0, 0, 1.0);
        // Upper regularised incomplete gamma Q(ndf/2, X²/2) is the χ² survival function; taking it directly
        // (rather than 1 − ChiSquared.CDF) keeps small p-values accurate.
        double p = SpecialFunctions.GammaUpperRegularized(ndf / 2.0, chiSquare / 2.0);
        return new ChiSquareResult(chiSquare, ndf, Math.Clamp(p, 0.0, 1.0));
    }

    private static void RequireVariances(ReadOnlySpan<double> sSq, string what)
    {
        for (int i = 0; i < sSq.Length; i++)
        {
            if (!double.IsFinite(sSq[i]) || sSq[i] < 0)
                throw new ArgumentException($"{what}[{i}] must be a finite, non-negative sum of squared weights.", what);
        }
    }
}
