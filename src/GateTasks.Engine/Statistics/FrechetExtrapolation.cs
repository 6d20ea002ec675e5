namespace GateTasks.Engine.Statistics;

/// <summary>
/// The Fréchet distance between a reference and a sample with its finite-size bias removed, from their blocked
/// moments (<see cref="BlockedCovariance"/>, same d and B). The plug-in FD is biased upwards by terms of order 1/n of
/// each side (at equal laws it is a positive quadratic form of the estimation errors), so it is computed on nested
/// subsets, the first j blocks of each side merged (sizes about N·j/B, j = 1..B), and extrapolated linearly to an
/// infinite sample by least squares: the method of Chong &amp; Forsyth (2020, "Effectively unbiased FID and Inception
/// Score and where to find them", CVPR) used for jet data by Kansal et al. (2023, Phys. Rev. D 107, 076017). With two
/// finite sides the leading bias is a/n_ref + b/n_sample; as both sides grow in the same proportion with j, it is
/// linear in x = 1/n_ref + 1/n_sample, the abscissa used, with n the Kish (1965) effective counts so that weighted
/// data enter by their statistical size.
/// The uncertainty is the delete-one-block jackknife (Quenouille 1956; Efron &amp; Tibshirani 1993, ch. 11) of the
/// whole extrapolation: block b is left out of both sides at once (every nested subset that held it loses it), and
/// the extrapolation repeated. Rows are given to blocks independently of their values, and reference and sample are independent, so the
/// pairs (reference block b, sample block b) are B independent, identically distributed units, which is what the
/// one-sample jackknife needs; leaving a pair out keeps the ratio of the two sides' sizes (the geometry of the
/// extrapolation) unchanged and costs B repetitions rather than 2B for a two-sample jackknife (Arvesen 1969).
/// </summary>
internal static class FrechetExtrapolation
{
    /// <summary>The estimate for a reference and a sample accumulated with the same d and B.</summary>
    public static FrechetEstimate Of(BlockedCovariance reference, BlockedCovariance sample)
    {
        if (reference.Dimension != sample.Dimension || reference.Blocks != sample.Blocks)
            throw new ArgumentException(
                $"Reference ({reference.Dimension} features, {reference.Blocks} blocks) and sample ({sample.Dimension} features, {sample.Blocks} blocks) do not match.",
                nameof(sample));
        var blocks = reference.Blocks;
        var points = NestedDistances(reference, sample, emptied: -1);
        var (intercept, slope) = LeastSquares(points);
        var raw = points[^1].Distance;

        var leftOut = new double[blocks];
        for (var b = 0; b < blocks; b++) leftOut[b] = LeastSquares(NestedDistances(reference, sample, b)).Intercept;
        return new FrechetEstimate(raw, intercept, slope, JackknifeStandardError(leftOut), points);
    }

    /// <summary>
    /// Jackknife standard error from the B leave-one-out values θ₍b₎: √((B − 1)/B · Σ(θ₍b₎ − θ̄)²)
    /// (Efron &amp; Tibshirani 1993, eq. 11.5); infinite when a leave-one-out value is undefined.
    /// </summary>
    public static double JackknifeStandardError(IReadOnlyList<double> leaveOneOut)
    {
        var n = leaveOneOut.Count;
        if (n < 2 || leaveOneOut.Any(v => !double.IsFinite(v))) return double.PositiveInfinity;
        var mean = leaveOneOut.Average();
        var sum = leaveOneOut.Sum(v => (v - mean) * (v - mean));
        return Math.Sqrt((n - 1.0) / n * sum);
    }

    /// <summary>
    /// FD between the fits of the first j blocks of each side, j = 1..B, with x = 1/n_ref + 1/n_sample; block
    /// <paramref name="emptied"/> (−1: none) taken as empty, so that a leave-one-out value is the same estimator on
    /// the data without that block: each nested subset loses the block if it held it, and the subsets keep their
    /// order. (Re-forming the subsets from the B − 1 blocks left would instead swap later blocks into the early
    /// subsets, and the leave-one-out values would vary by more than the deletion, inflating the error.)
    /// Subsets left with nothing give no point.
    /// </summary>
    private static (double InverseSize, double Distance)[] NestedDistances(BlockedCovariance reference, BlockedCovariance sample, int emptied)
    {
        var d = reference.Dimension;
        CovarianceMoments refPlus = new(d), refMinus = new(d), samplePlus = new(d), sampleMinus = new(d);
        var points = new List<(double, double)>(reference.Blocks);
        for (var b = 0; b < reference.Blocks; b++)
        {
            if (b == emptied && b == 0) continue;
            if (b == emptied)
            {
                points.Add(points[^1]);
                continue;
            }
            refPlus.Merge(reference.Positive(b));
            refMinus.Merge(reference.Negative(b));
            samplePlus.Merge(sample.Positive(b));
            sampleMinus.Merge(sample.Negative(b));
            var r = GaussianFit.Join(refPlus, refMinus);
            var s = GaussianFit.Join(samplePlus, sampleMinus);
            var x = r.EffectiveCount > 0 && s.EffectiveCount > 0 ? 1 / r.EffectiveCount + 1 / s.EffectiveCount : double.NaN;
            points.Add((x, FrechetDistance.Between(r, s)));
        }
        return [.. points];
    }

    /// <summary>Ordinary least-squares line through the finite points; NaN when fewer than two distinct abscissae.</summary>
    private static (double Intercept, double Slope) LeastSquares(IReadOnlyList<(double X, double Y)> points)
    {
        var usable = points.Where(p => double.IsFinite(p.X) && double.IsFinite(p.Y)).ToArray();
        if (usable.Length < 2) return (double.NaN, double.NaN);
        var mx = usable.Average(p => p.X);
        var my = usable.Average(p => p.Y);
        double sxx = 0, sxy = 0;
        foreach (var (x, y) in usable)
        {
            sxx += (x - mx) * (x - mx);
            sxy += (x - mx) * (y - my);
        }
        if (sxx == 0) return (double.NaN, double.NaN);
        var slope = sxy / sxx;
        return (my - slope * mx, slope);
    }
}
