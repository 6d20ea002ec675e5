using MathNet.Numerics;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Two-sample Cramér–von Mises test (Anderson 1962, Ann. Math. Stat. 33:1148).
/// U = m Σ(r_i − i)² + n Σ(s_j − j)² with r, s the pooled (mid)ranks of the sorted samples;
/// T = U/(mn(m+n)) − (4mn − 1)/(6(m+n)). Exact p-value from the permutation distribution of U for small
/// samples; otherwise T is standardised with its exact mean and variance (Anderson 1962) and referred to
/// the limiting one-sample Cramér–von Mises distribution (Anderson &amp; Darling 1952).
/// </summary>
internal static class CramerVonMises
{
    /// <summary><see cref="TwoSample"/> is exact when both samples have at most this many values.</summary>
    internal const int ExactMaxSize = 20;

    internal const string ExactMethod = "exact";
    internal const string AsymptoticMethod = "asymptotic";

    /// <summary>
    /// Two-sample test. Ties get midranks; the exact p-value is then that of the continuous null.
    /// </summary>
    internal static CramerVonMisesResult TwoSample(ReadOnlySpan<double> x, ReadOnlySpan<double> y)
    {
        (double u, double t) = Statistic(x, y);
        int m = x.Length, n = y.Length;
        if (m <= ExactMaxSize && n <= ExactMaxSize)
            return new CramerVonMisesResult(u, t, ExactUpperTail(m, n, u), ExactMethod);
        return new CramerVonMisesResult(u, t, AsymptoticPValue(t, m, n), AsymptoticMethod);
    }

    /// <summary>Two-sample test with the asymptotic p-value whatever the sample sizes.</summary>
    internal static CramerVonMisesResult TwoSampleAsymptotic(ReadOnlySpan<double> x, ReadOnlySpan<double> y)
    {
        (double u, double t) = Statistic(x, y);
        return new CramerVonMisesResult(u, t, AsymptoticPValue(t, x.Length, y.Length), AsymptoticMethod);
    }

    /// <summary>
    /// Exact P(U ≥ u) over all C(m+n, m) equally likely arrangements. A lattice path taking an x-step after
    /// j y's adds m·j² to U and a y-step after i x's adds n·i², so U is accumulated along the path by
    /// dynamic programming with a table of (U value → path count) per lattice point. Both sizes must be at
    /// most <see cref="ExactMaxSize"/> (counts then fit a long).
    /// </summary>
    internal static double ExactUpperTail(int m, int n, double u)
    {
        if (m <= 0 || n <= 0)
            throw new ArgumentOutOfRangeException(nameof(m), "Sample sizes must be positive.");
        if (m > ExactMaxSize || n > ExactMaxSize)
            throw new ArgumentOutOfRangeException(nameof(m),
                $"Exact Cramér–von Mises p-value is limited to samples of at most {ExactMaxSize}; use the asymptotic one.");
        if (double.IsNaN(u))
            throw new ArgumentException("U is NaN.", nameof(u));

        // row[j] is the distribution of U over paths to (i, j); row i is built from row i − 1 in place.
        var row = new Dictionary<long, long>[n + 1];
        row[0] = new Dictionary<long, long> { [0] = 1 };
        for (int j = 1; j <= n; j++)
            row[j] = new Dictionary<long, long> { [0] = 1 }; // along i = 0 every y-step adds n·0² = 0
        for (int i = 1; i <= m; i++)
        {
            long yStep = (long)n * i * i;
            for (int j = 0; j <= n; j++)
            {
                long xStep = (long)m * j * j;
                var next = new Dictionary<long, long>(row[j].Count + (j > 0 ? row[j - 1].Count : 0));
                foreach (var (value, count) in row[j])
                    Accumulate(next, value + xStep, count);
                if (j > 0)
                {
                    foreach (var (value, count) in row[j - 1])
                        Accumulate(next, value + yStep, count);
                }
                row[j] = next;
            }
        }

        // U from data with midranks may be fractional; lattice U values are integers.
        long threshold = (long)Math.Ceiling(u - 1e-9 * Math.Max(1.0, Math.Abs(u)));
        long hits = 0, total = 0;
        foreach (var (value, count) in row[n])
        {
            total += count;
            if (value >= threshold)
                hits += count;
        }
        return (double)hits / total;
    }

    /// <summary>
    /// P-value of T from the limiting distribution after Anderson's (1962) standardisation:
    /// E[T] = (1 + 1/N)/6, Var[T] = (N+1)(4mnN − 3(m² + n²) − 2mn)/(180 mn N²), T* = 1/6 + (T − E[T])/√(45 Var[T]).
    /// </summary>
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

    /// <summary>(U, T) for two samples, midranks for ties.</summary>
    internal static (double U, double T) Statistic(ReadOnlySpan<double> x, ReadOnlySpan<double> y)
    {
        SampleChecks.RequireNonEmpty(x, nameof(x));
        SampleChecks.RequireNonEmpty(y, nameof(y));
        SampleChecks.RequireFinite(x, nameof(x));
        SampleChecks.RequireFinite(y, nameof(y));
        int m = x.Length, n = y.Length, total = m + n;
        var values = new double[total];
        var fromX = new bool[total];
        x.CopyTo(values);
        y.CopyTo(values.AsSpan(m));
        for (int i = 0; i < m; i++) fromX[i] = true;
        Array.Sort(values, fromX);

        // Walk tie groups; within a group every member gets the midrank, and the i-th x (in sorted order)
        // is compared with its index i, so only the group's midrank and the running counts matter.
        double sumX = 0, sumY = 0;
        int seenX = 0, seenY = 0, start = 0;
        while (start < total)
        {
            int end = start;
            while (end + 1 < total && values[end + 1] == values[start]) end++;
            double midrank = (start + end + 2) / 2.0;
            for (int p = start; p <= end; p++)
            {
                if (fromX[p]) { seenX++; double d = midrank - seenX; sumX += d * d; }
                else { seenY++; double d = midrank - seenY; sumY += d * d; }
            }
            start = end + 1;
        }
        double u = m * sumX + n * sumY;
        double mn = (double)m * n;
        double t = u / (mn * total) - (4 * mn - 1) / (6.0 * total);
        return (u, t);
    }

    private static void Accumulate(Dictionary<long, long> table, long value, long count)
    {
        table[value] = table.TryGetValue(value, out long existing) ? existing + count : count;
    }
}
