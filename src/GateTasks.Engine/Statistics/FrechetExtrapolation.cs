namespace GateTasks.Engine.Statistics;

/// <summary>
/// The Fréchet distance between a reference and a sample with its finite-size bias removed, from their blocked
/// moments (<see cref="BlockedCovariance"/>, same d and B). The plug-in FD is biased upwards by terms of order 1/n of
/// each side (at equal laws it is a positive quadratic form of the estimation errors), so it is computed on subsets of
/// j blocks of each side (sizes about N·j/B, j = 1..B) and extrapolated linearly to an infinite sample by least
/// squares: the method of Chong &amp; Forsyth (2020, "Effectively unbiased FID and Inception Score and where to find
/// them", CVPR), used for jet data by Kansal et al. (2023, Phys. Rev. D 107, 076017). With two finite sides the
/// leading bias is a/n_ref + b/n_sample; as both sides grow in the same proportion with j, it is linear in
/// x = 1/n_ref + 1/n_sample, the abscissa used, with n the Kish (1965) effective counts so that weighted data enter by
/// their statistical size. Each size is the mean over the B cyclic windows of j consecutive blocks rather than one
/// nested subset: every block then plays the same part (the jackknife below presumes a statistic symmetric in its
/// units), and the extrapolated value scatters about half as much (measured over 30 replicas at equal laws, d = 5,
/// 20 000 rows a side, B = 16: a standard deviation of 0.00042 against 0.00077 for one nested series).
/// The uncertainty is the delete-one-block jackknife (Quenouille 1956; Efron &amp; Tibshirani 1993, ch. 11) of the
/// whole estimate: block b is left out of both sides at once and the estimate repeated on the B − 1 blocks left.
/// Rows are given to blocks independently of their values, and reference and sample are independent, so the pairs
/// (reference block b, sample block b) are B independent, identically distributed units, which is what the
/// one-sample jackknife needs; leaving a pair out keeps the ratio of the two sides' sizes (the geometry of the
/// extrapolation) unchanged and costs B repetitions rather than 2B for a two-sample jackknife (Arvesen 1969).
/// The jackknife variance is biased upwards (Efron &amp; Stein 1981, Ann. Stat. 9:586) by about the statistic's
/// second-order (quadratic) part, which is all there is when the laws are equal: there the standard error is about
/// √2 times the true spread (conservative; measured 1.37 over 300 replicas at d = 5, 20 000 rows a side, B = 16),
/// while at a distance well above its noise it is close to it (FrechetExtrapolationTests).
/// Cost: about B³/2 distances, each one Cholesky factorisation and one symmetric eigendecomposition of d × d.
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
        var windows = new Dictionary<(int Start, int Size), (double X, double Fd)>();
        var points = WindowDistances(reference, sample, leftOut: -1, windows);
        var (intercept, slope) = LeastSquares(points);
        var raw = points[^1].Distance;

        // The windows are only read from here on, so the leave-one-out repetitions run side by side.
        var leftOut = new double[blocks];
        Parallel.For(0, blocks, b => leftOut[b] = LeastSquares(WindowDistances(reference, sample, b, windows)).Intercept);
        return new FrechetEstimate(raw, intercept, slope, JackknifeStandardError(leftOut), points);
    }

    /// <summary>
    /// Jackknife standard error from the B leave-one-out values θ₍b₎: √((B − 1)/B · Σ(θ₍b₎ − θ̄)²)
    /// (Efron &amp; Tibshirani 1993, ch. 11); infinite when a leave-one-out value is undefined.
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
    /// One point per subset size j = 1..m over the m blocks present (all but <paramref name="leftOut"/>, −1: none):
    /// the mean FD over the m cyclic windows of j consecutive present blocks (one window for j = m), at the mean
    /// x = 1/n_ref + 1/n_sample of those windows. Averaging over the windows makes the estimator treat every block
    /// alike (symmetric under a cyclic relabelling), which the jackknife presumes, and lowers its variance.
    /// </summary>
    /// <remarks>
    /// With all blocks present every window's x and FD go into <paramref name="windows"/>, keyed by first block and
    /// size. With block b left out, a window that does not run across b's place is the same run of blocks as the
    /// full set's window with the same first block and size, merged in the same order, so its numbers are taken from
    /// there (identical, not recomputed): only the windows that bridge the gap cost a distance, about half of them.
    /// </remarks>
    private static (double InverseSize, double Distance)[] WindowDistances(BlockedCovariance reference, BlockedCovariance sample, int leftOut,
        Dictionary<(int Start, int Size), (double X, double Fd)> windows)
    {
        var d = reference.Dimension;
        var blocks = reference.Blocks;
        var present = Enumerable.Range(0, reference.Blocks).Where(b => b != leftOut).ToArray();
        var m = present.Length;
        // Each start's run of windows on its own (side by side on the cores), then summed in the order of the starts,
        // so the points do not depend on the threads.
        var runs = new (double X, double Fd, bool New)[m][];
        Parallel.For(0, m, s =>
        {
            CovarianceMoments refPlus = new(d), refMinus = new(d), samplePlus = new(d), sampleMinus = new(d);
            var sizes = s == 0 ? m : m - 1; // the whole set once, from the first start
            var run = new (double X, double Fd, bool New)[sizes];
            for (var j = 0; j < sizes; j++)
            {
                var b = present[(s + j) % m];
                refPlus.Merge(reference.Positive(b));
                refMinus.Merge(reference.Negative(b));
                samplePlus.Merge(sample.Positive(b));
                sampleMinus.Merge(sample.Negative(b));
                var first = present[s];
                var size = j + 1;
                if (leftOut >= 0 && (leftOut - first + blocks) % blocks >= size)
                {
                    var (x, fd) = windows[(first, size)];
                    run[j] = (x, fd, false);
                }
                else
                {
                    var r = GaussianFit.Join(refPlus, refMinus);
                    var f = GaussianFit.Join(samplePlus, sampleMinus);
                    var x = r.EffectiveCount > 0 && f.EffectiveCount > 0 ? 1 / r.EffectiveCount + 1 / f.EffectiveCount : double.NaN;
                    run[j] = (x, FrechetDistance.Between(r, f), true);
                }
            }
            runs[s] = run;
        });
        var sums = new (double X, double Fd, int N)[m];
        for (var s = 0; s < m; s++)
            for (var j = 0; j < runs[s].Length; j++)
            {
                var (x, fd, computed) = runs[s][j];
                if (leftOut < 0 && computed) windows[(present[s], j + 1)] = (x, fd);
                sums[j] = (sums[j].X + x, sums[j].Fd + fd, sums[j].N + 1);
            }
        return sums.Select(t => (t.X / t.N, t.Fd / t.N)).ToArray();
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
