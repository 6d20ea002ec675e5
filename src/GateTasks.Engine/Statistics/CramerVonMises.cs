using MathNet.Numerics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Two-sample Cramér–von Mises test on binned data (Anderson 1962, Ann. Math. Stat. 33:1148): T is
/// standardised with its exact mean and variance (Anderson 1962) and referred to the limiting one-sample
/// Cramér–von Mises distribution (Anderson &amp; Darling 1952).
/// </summary>
internal static class CramerVonMises
{
    /// <summary>
    /// T and its asymptotic p-value from binned data: <paramref name="a"/> and <paramref name="b"/> hold each sample's
    /// count per bin (bins in increasing order; effective counts for weighted samples, an approximation).
    /// </summary>
    internal static (double T, double PValue) FromCounts(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        // Anderson (1962): T = (mn/N²) Σ over the N pooled observations of (F_m − G_n)², the two empirical CDFs at
        // each observation; with binned data each bin is one distinct value holding l_j observations.
        if (a.Length != b.Length) throw new ArgumentException("The two histograms differ in their number of bins.");
        double m = 0, n = 0;
        foreach (var x in a) m += x;
        foreach (var x in b) n += x;
        if (!(m > 0) || !(n > 0)) throw new ArgumentException("Both samples need entries.");
        double fa = 0, fb = 0, sum = 0;
        for (var j = 0; j < a.Length; j++)
        {
            fa += a[j];
            fb += b[j];
            var d = fa / m - fb / n;
            sum += (a[j] + b[j]) * d * d;
        }
        var total = m + n;
        var t = m * n / (total * total) * sum;
        var p = AsymptoticPValue(t, (int)Math.Max(1, Math.Round(m)), (int)Math.Max(1, Math.Round(n)));
        return (t, p);
    }

    /// <summary>
    /// P-value of T from the limiting distribution after Anderson's (1962) standardisation:
    /// E[T] = (1 + 1/N)/6, Var[T] = (N+1)(4mnN − 3(m² + n²) − 2mn)/(180 mn N²), T* = 1/6 + (T − E[T])/√(45 Var[T]).
    /// </summary>
    internal static double AsymptoticPValue(double t, int m, int n)
    {
        double mm = m, nn = n, k = mm * nn, bigN = mm + nn;
        double mean = (1 + 1 / bigN) / 6;
        double variance = (bigN + 1) * (4 * k * bigN - 3 * (mm * mm + nn * nn) - 2 * k) / (45 * bigN * bigN * 4 * k);
        double standardised = 1.0 / 6 + (t - mean) / Math.Sqrt(45 * variance);
        return Math.Clamp(1.0 - LimitCdf(standardised), 0.0, 1.0);
    }

    /// <summary>
    /// Limiting distribution of the one-sample statistic (Anderson &amp; Darling 1952), in the Bessel-function
    /// form of Csörgő &amp; Faraway (1996, eq. 1.3):
    /// F(x) = Σ_{k≥0} Γ(k+½)/(Γ(k+1) π^{3/2} √x) √(4k+1) e^{−q} K_{1/4}(q), q = (4k+1)²/(16x).
    /// </summary>
    internal static double LimitCdf(double x)
    {
        if (double.IsNaN(x))
            throw new ArgumentException("x is NaN.", nameof(x));
        // Below this the CDF is under 1e-18 and the Bessel terms underflow.
        if (x <= 0.003)
            return 0.0;
        double sum = 0;
        double scale = 1.0 / (Math.Pow(Math.PI, 1.5) * Math.Sqrt(x));
        for (int k = 0; k < 200; k++)
        {
            double y = 4.0 * k + 1.0;
            double q = y * y / (16.0 * x);
            // e^{−q} K(q) = e^{−2q} · (e^{q} K(q)); the scaled Bessel function avoids underflow of K alone.
            double term = Math.Exp(SpecialFunctions.GammaLn(k + 0.5) - SpecialFunctions.GammaLn(k + 1.0) - 2 * q)
                          * scale * Math.Sqrt(y) * SpecialFunctions.BesselKScaled(0.25, q);
            sum += term;
            if (Math.Abs(term) < 1e-16 * Math.Abs(sum))
                break;
        }
        return Math.Clamp(sum, 0.0, 1.0);
    }
}
