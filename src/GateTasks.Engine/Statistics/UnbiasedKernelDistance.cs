using System.Globalization;
using MathNet.Numerics;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// The unbiased estimator of the squared maximum mean discrepancy (Gretton, Borgwardt, Rasch, Schölkopf &amp; Smola
/// 2012, "A kernel two-sample test", JMLR 13:723, Lemma 6) with the cubic polynomial kernel k(x, y) = (x·y/d + 1)³
/// used by Kansal et al. (2023, "Evaluating generative models in high energy physics", Phys. Rev. D 107, 076017):
/// MMD²ᵤ = Kxx + Kyy − 2Kxy. Rows carry event weights (negative allowed) and each term is the weighted U- or V-mean:
/// Kxx = Σ_{i≠j} wᵢwⱼ k(xᵢ, xⱼ) / Σ_{i≠j} wᵢwⱼ, likewise Kyy with the weights v, and
/// Kxy = Σᵢ Σⱼ wᵢvⱼ k(xᵢ, yⱼ) / (Σw Σv); with every weight 1 this is Lemma 6's estimator exactly. With unequal
/// weights each term is a ratio of unbiased sums (self-normalised), so the estimate is consistent with a bias of
/// order 1/n_eff rather than exactly unbiased.
/// The kernel is not translation invariant: the caller standardises the rows (for instance by the reference's means
/// and standard deviations) before calling.
/// The double sums are taken through the kernel's finite feature map (<see cref="CubicKernelFeatureSums"/>), at
/// C(d+3, 3) multiply-adds a row: 50 000 rows a side of 20 features in a fraction of a second. Rows wider than
/// <see cref="MaxFeatureMapWidth"/> fall back to direct kernel sums on small sub-blocks (see
/// <see cref="KernelDistanceEstimate.FromFeatureMap"/>). The uncertainty comes from B disjoint blocks, rows assigned
/// by a seeded permutation, reported as the mean ± standard error of the block estimates (Kansal et al. 2023 report
/// their kernel distance as the mean and spread over batches).
/// </summary>
internal static class UnbiasedKernelDistance
{
    /// <summary>The number of blocks the uncertainty is taken from unless the caller says otherwise.</summary>
    internal const int DefaultBlocks = 10;

    /// <summary>
    /// The widest rows the feature map is used for: C(35, 3) = 6 545 monomials. Measured with
    /// tests/GateTasks.Benchmarks (KernelDistanceBenchmarks, 50 000 weighted rows a side, one core of a loaded machine)
    /// the whole estimate takes about 30 ms at d = 10 and 115 ms at d = 20 and grows with C(d+3, 3), so about 0.4 s at
    /// d = 32, where the sub-block fallback costs about as much (0.4 s at d = 40).
    /// </summary>
    internal const int MaxFeatureMapWidth = 32;

    /// <summary>
    /// Multiply-adds the wide-row fallback may spend per row of either side. A row of a sub-block of m rows a side meets
    /// about m partners (half of the m − 1 within its set, all m across) at d multiply-adds each, so the sub-blocks
    /// hold about this / d rows: 125 rows for 40 features, about 5·10⁸ multiply-adds for 2 × 50 000 rows.
    /// </summary>
    internal const int DirectMultiplyAddsPerRow = 5_000;

    /// <summary>
    /// MMD²ᵤ from two sets' feature sums: the full-sample estimate, for sums filled in a stream or merged from shards.
    /// Throws when a set's Σ_{i≠j} wᵢwⱼ or Σw is not positive (fewer than two rows, or negative weights dominating):
    /// the weighted mean is then undefined.
    /// </summary>
    internal static double FromSums(CubicKernelFeatureSums x, CubicKernelFeatureSums y)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        RequireNormalisable(x.WeightSum, x.DistinctPairWeight, nameof(x));
        RequireNormalisable(y.WeightSum, y.DistinctPairWeight, nameof(y));
        double kxx = x.DistinctPairSum() / x.DistinctPairWeight;
        double kyy = y.DistinctPairSum() / y.DistinctPairWeight;
        double kxy = x.PairSum(y) / (x.WeightSum * y.WeightSum);
        return kxx + kyy - 2 * kxy;
    }

    /// <summary>
    /// MMD²ᵤ on all rows and on <paramref name="blocks"/> seeded blocks. Each set's rows are put in a random order
    /// (MathNet <see cref="Combinatorics.GeneratePermutation"/> driven by Xoshiro256StarStar seeded with
    /// <paramref name="seed"/>, the first set's permutation first) and cut into B contiguous blocks of ⌊n/B⌋ or ⌈n/B⌉
    /// rows; block b of one set is compared with block b of the other. Null weights mean every weight 1. Each set
    /// needs at least 2B rows. Throws <see cref="ArgumentException"/> for ragged, empty or non-finite rows or weights,
    /// and when a block's (for wide rows, a sub-block's) Σw or Σ_{i≠j} wᵢwⱼ is not positive, where the weighted means
    /// are undefined: a number is never returned for them.
    /// </summary>
    internal static KernelDistanceEstimate Estimate(double[][] x, double[]? xWeights, double[][] y, double[]? yWeights,
        int blocks = DefaultBlocks, int seed = 1)
    {
        int d = RequireRows(x, nameof(x), -1);
        RequireRows(y, nameof(y), d);
        KernelPreconditions.RequireRowWeights(xWeights, x.Length, nameof(xWeights));
        KernelPreconditions.RequireRowWeights(yWeights, y.Length, nameof(yWeights));
        if (blocks < 2)
            throw new ArgumentOutOfRangeException(nameof(blocks), blocks, "At least two blocks are needed for a spread.");
        if (x.Length < 2 * blocks || y.Length < 2 * blocks)
            throw new ArgumentException(
                string.Create(CultureInfo.InvariantCulture,
                    $"{blocks} blocks need at least {2 * blocks} rows a side (two a block); got {x.Length} and {y.Length}."),
                x.Length < 2 * blocks ? nameof(x) : nameof(y));

        var random = new Xoshiro256StarStar(seed, threadSafe: false);
        int[] xOrder = Combinatorics.GeneratePermutation(x.Length, random);
        int[] yOrder = Combinatorics.GeneratePermutation(y.Length, random);

        var estimates = new double[blocks];
        double full;
        int subBlockRows = 0;
        if (d <= MaxFeatureMapWidth)
        {
            CubicKernelFeatureSums[] xBlocks = BlockSums(x, xWeights, xOrder, blocks, d);
            CubicKernelFeatureSums[] yBlocks = BlockSums(y, yWeights, yOrder, blocks, d);
            var xAll = new CubicKernelFeatureSums(d);
            var yAll = new CubicKernelFeatureSums(d);
            for (int b = 0; b < blocks; b++)
            {
                estimates[b] = FromSums(xBlocks[b], yBlocks[b]);
                xAll.Merge(xBlocks[b]);
                yAll.Merge(yBlocks[b]);
            }
            full = FromSums(xAll, yAll);
        }
        else
        {
            // Sub-blocks small enough that the direct pair sums cost about the budget per row.
            subBlockRows = Math.Max(DirectMultiplyAddsPerRow / d, 16);
            for (int b = 0; b < blocks; b++)
            {
                (int xStart, int xEnd) = BlockRange(x.Length, blocks, b);
                (int yStart, int yEnd) = BlockRange(y.Length, blocks, b);
                int longest = Math.Max(xEnd - xStart, yEnd - yStart);
                int parts = Math.Max(1, Math.Min((longest + subBlockRows - 1) / subBlockRows, Math.Min(xEnd - xStart, yEnd - yStart) / 2));
                double sum = 0;
                for (int p = 0; p < parts; p++)
                {
                    (int xs, int xe) = BlockRange(xEnd - xStart, parts, p);
                    (int ys, int ye) = BlockRange(yEnd - yStart, parts, p);
                    sum += Direct(x, xWeights, xOrder.AsSpan(xStart + xs, xe - xs), y, yWeights, yOrder.AsSpan(yStart + ys, ye - ys));
                }
                estimates[b] = sum / parts;
            }
            full = estimates.Average();
        }

        double mean = estimates.Average();
        double ss = 0;
        foreach (double e in estimates) ss += (e - mean) * (e - mean);
        double sd = Math.Sqrt(ss / (blocks - 1));
        return new KernelDistanceEstimate(full, estimates, mean, sd, sd / Math.Sqrt(blocks), d <= MaxFeatureMapWidth, subBlockRows);
    }

    /// <summary>Rows ⌊b·n/B⌋ … ⌊(b+1)·n/B⌋ − 1: B contiguous blocks whose sizes differ by at most one.</summary>
    private static (int Start, int End) BlockRange(int n, int blocks, int b) =>
        ((int)((long)b * n / blocks), (int)((long)(b + 1) * n / blocks));

    private static CubicKernelFeatureSums[] BlockSums(double[][] rows, double[]? weights, int[] order, int blocks, int d)
    {
        var sums = new CubicKernelFeatureSums[blocks];
        for (int b = 0; b < blocks; b++)
        {
            sums[b] = new CubicKernelFeatureSums(d);
            (int start, int end) = BlockRange(rows.Length, blocks, b);
            for (int p = start; p < end; p++)
            {
                int r = order[p];
                sums[b].Add(rows[r], weights?[r] ?? 1.0);
            }
        }
        return sums;
    }

    /// <summary>
    /// MMD²ᵤ of the same weighted form from the kernel evaluated on every pair of rows, O((n + m)² d): the estimator
    /// the wide-row fallback applies to each sub-block, here on all rows (null weights: every weight 1).
    /// </summary>
    internal static double DirectEstimate(double[][] x, double[]? xWeights, double[][] y, double[]? yWeights)
    {
        int d = RequireRows(x, nameof(x), -1);
        RequireRows(y, nameof(y), d);
        KernelPreconditions.RequireRowWeights(xWeights, x.Length, nameof(xWeights));
        KernelPreconditions.RequireRowWeights(yWeights, y.Length, nameof(yWeights));
        return Direct(x, xWeights, Enumerable.Range(0, x.Length).ToArray(), y, yWeights, Enumerable.Range(0, y.Length).ToArray());
    }

    /// <summary>MMD²ᵤ of the same weighted form from the kernel evaluated on every pair of the selected rows.</summary>
    private static double Direct(double[][] x, double[]? xWeights, ReadOnlySpan<int> xRows, double[][] y, double[]? yWeights, ReadOnlySpan<int> yRows)
    {
        (double kxx, double sx) = Within(x, xWeights, xRows, nameof(x));
        (double kyy, double sy) = Within(y, yWeights, yRows, nameof(y));
        double kxy = 0;
        foreach (int i in xRows)
        {
            double wi = xWeights?[i] ?? 1.0, row = 0;
            foreach (int j in yRows) row += (yWeights?[j] ?? 1.0) * CubicKernelFeatureSums.Kernel(x[i], y[j]);
            kxy += wi * row;
        }
        return kxx + kyy - 2 * kxy / (sx * sy);
    }

    /// <summary>Σ_{i≠j} wᵢwⱼ k / Σ_{i≠j} wᵢwⱼ over the selected rows, and their Σw.</summary>
    private static (double Mean, double WeightSum) Within(double[][] rows, double[]? weights, ReadOnlySpan<int> selected, string what)
    {
        double pairs = 0, sw = 0, sw2 = 0;
        for (int a = 0; a < selected.Length; a++)
        {
            int i = selected[a];
            double wi = weights?[i] ?? 1.0, row = 0;
            sw += wi;
            sw2 += wi * wi;
            for (int b = a + 1; b < selected.Length; b++)
            {
                int j = selected[b];
                row += (weights?[j] ?? 1.0) * CubicKernelFeatureSums.Kernel(rows[i], rows[j]);
            }
            pairs += 2 * wi * row;
        }
        RequireNormalisable(sw, sw * sw - sw2, what);
        return (pairs / (sw * sw - sw2), sw);
    }

    private static void RequireNormalisable(double weightSum, double distinctPairWeight, string what)
    {
        if (!(weightSum > 0) || !(distinctPairWeight > 0))
            throw new ArgumentException(
                string.Create(CultureInfo.InvariantCulture,
                    $"{what}: the weights sum to {weightSum:G6} and Σ_(i≠j) wᵢwⱼ = {distinctPairWeight:G6}; both must be positive for the weighted kernel means (two rows at least, negative weights not dominating)."),
                what);
    }


    /// <summary>Checks a row set (non-empty, same width, finite values); returns the width.</summary>
    private static int RequireRows(double[][] rows, string what, int width)
    {
        ArgumentNullException.ThrowIfNull(rows, what);
        if (rows.Length == 0)
            throw new ArgumentException($"{what} has no rows; the kernel distance needs at least two a block.", what);
        return KernelPreconditions.RequireRowShape(rows, what, width);
    }
}
