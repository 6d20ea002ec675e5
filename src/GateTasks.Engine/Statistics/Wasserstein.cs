namespace GateTasks.Engine.Statistics;

/// <summary>
/// Wasserstein-1 (earth mover's) distance between two one-dimensional distributions,
/// W₁ = ∫ |F(t) − G(t)| dt (Vallender 1974 for the CDF form), between two histograms on the same edges.
/// </summary>
internal static class Wasserstein
{
    /// <summary>
    /// W₁ between two histograms on the same bin edges, taking each bin's content as spread uniformly over
    /// the bin: both CDFs are then piecewise linear through the edges and |F − G| is integrated exactly over
    /// [edges[0], edges[^1]] (in axis units). Contents are normalised to unit mass; under/overflow are not
    /// part of the axis and must be left out.
    /// </summary>
    internal static double Histograms(ReadOnlySpan<double> edges, ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        KernelPreconditions.RequireSameLength(a.Length, b.Length, nameof(a), nameof(b));
        if (edges.Length != a.Length + 1)
            throw new ArgumentException($"{a.Length} bins need {a.Length + 1} edges, got {edges.Length}.", nameof(edges));
        KernelPreconditions.RequireFinite(edges, nameof(edges));
        for (int i = 1; i < edges.Length; i++)
        {
            if (!(edges[i] > edges[i - 1]))
                throw new ArgumentException($"Bin edges must increase strictly (edges[{i}]).", nameof(edges));
        }
        double ta = KernelPreconditions.RequireContents(a, nameof(a));
        double tb = KernelPreconditions.RequireContents(b, nameof(b));
        double ca = 0, cb = 0, area = 0;
        for (int i = 0; i < a.Length; i++)
        {
            double d0 = ca / ta - cb / tb;
            ca += a[i];
            cb += b[i];
            double d1 = ca / ta - cb / tb;
            double width = edges[i + 1] - edges[i];
            area += width * LinearAbsMean(d0, d1);
        }
        return area;
    }

    /// <summary>Mean of |d(t)| for d linear from d0 to d1 on [0, 1], splitting at the sign change.</summary>
    private static double LinearAbsMean(double d0, double d1)
    {
        if (d0 * d1 >= 0)
            return (Math.Abs(d0) + Math.Abs(d1)) / 2;
        return (d0 * d0 + d1 * d1) / (2 * (Math.Abs(d0) + Math.Abs(d1)));
    }
}
