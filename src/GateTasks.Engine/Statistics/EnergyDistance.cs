using System.Globalization;
using System.Numerics;
using GateTasks.Engine.Diagnostics;
using MathNet.Numerics.Random;

namespace GateTasks.Engine.Statistics;

/// <summary>
/// Two-sample energy test of equal multivariate distributions (Székely &amp; Rizzo 2004, "Testing for equal
/// distributions in high dimension"): E = 2E|X−Y| − E|X−X′| − E|Y−Y′|, which is zero exactly when the
/// distributions agree, in V-statistic form (every mean over all ordered pairs, i = j included), Euclidean
/// distance between rows of d features. Rows may carry weights (event weights, signed allowed): every mean is then
/// the weighted one with each sample's weights normalised to sum to one, E = 2ΣᵢΣⱼ aᵢbⱼ|xᵢ−yⱼ| − Σᵢₖ aᵢaₖ|xᵢ−xₖ| −
/// Σⱼₗ bⱼbₗ|yⱼ−yₗ|, aᵢ = wᵢ/Σw (the energy distance of the two weighted empirical laws, Székely &amp; Rizzo 2013,
/// "Energy statistics", J. Stat. Plan. Inference 143:1249), with all weights 1 the unweighted statistic exactly.
/// </summary>
internal static class EnergyDistance
{
    /// <summary>
    /// Largest pooled row count <see cref="PermutationTest"/> accepts. The pooled distance matrix is kept as a
    /// packed upper triangle of doubles, N(N−1)/2 · 8 bytes: 5 000 rows need 100 MB; 20 000 would need 1.6 GB.
    /// </summary>
    internal const int MaxPooledRows = 5_000;

    /// <summary>The scaled two-sample energy test statistic T = nm/(n+m)·E (Székely &amp; Rizzo 2004), n and m Kish (1965) effective counts when weighted.</summary>
    private static double TestStatistic(double eStatistic, double n, double m) => n * m / (n + m) * eStatistic;

    /// <summary>
    /// Two-sample energy test of equal distributions with a permutation p-value (Székely &amp; Rizzo 2004):
    /// the pooled rows are relabelled at random <paramref name="permutations"/> times (MathNet
    /// Xoshiro256StarStar seeded with <paramref name="seed"/>, so the result is reproducible) and
    /// p = (1 + #{T* ≥ T})/(1 + B). The pooled distance matrix is computed once, so each permutation costs
    /// O(N²) additions. At most <see cref="MaxPooledRows"/> pooled rows. With <paramref name="stopAfter"/> = h,
    /// relabelling stops at the h-th permutation as extreme as the observed one and p = h/L, L the permutations
    /// done: the sequential Monte Carlo p-value of Besag &amp; Clifford (1991, Biometrika 78:301), valid like the
    /// full one, so samples far from significance cost a few dozen permutations instead of thousands.
    /// With <paramref name="xWeights"/> and <paramref name="yWeights"/> (null: every weight 1) the statistic is the
    /// weighted one and each row keeps its weight when relabelled (rows and their weights are exchangeable under equal
    /// laws); the scaled T then uses Kish effective counts. A labelling whose weights sum to zero or less on a side has
    /// no statistic and counts as extreme (conservative).
    /// </summary>
    internal static EnergyDistanceResult PermutationTest(double[][] x, double[][] y, int permutations, int seed, int stopAfter = int.MaxValue,
        double[]? xWeights = null, double[]? yWeights = null)
    {
        int d = RequireRows(x, nameof(x), -1);
        RequireRows(y, nameof(y), d);
        KernelPreconditions.RequireRowWeights(xWeights, x.Length, nameof(xWeights));
        KernelPreconditions.RequireRowWeights(yWeights, y.Length, nameof(yWeights));
        if (permutations < 1)
            throw new ArgumentOutOfRangeException(nameof(permutations), permutations, "At least one permutation is needed.");
        int n = x.Length, m = y.Length, total = n + m;
        if (total > MaxPooledRows)
            throw new ArgumentException(
                string.Create(CultureInfo.InvariantCulture,
                    $"The energy permutation test keeps the pooled distance matrix in memory and accepts at most {MaxPooledRows} pooled rows; got {total}. Subsample first (e.g. with a reservoir)."),
                nameof(x));

        double[][] pooled = new double[total][];
        x.CopyTo(pooled, 0);
        y.CopyTo(pooled, n);
        var weights = new double[total];
        for (int i = 0; i < total; i++) weights[i] = i < n ? xWeights?[i] ?? 1.0 : yWeights?[i - n] ?? 1.0;
        var packed = new double[(long)total * (total - 1) / 2];
        // Row sums and the total weighted by the partner's weight: Rᵢ = Σₖ wₖ|zᵢ−zₖ|, S = Σ_{i<k} wᵢwₖ|zᵢ−zₖ|.
        var rowSums = new double[total];
        double all = 0;
        long at = 0;
        for (int i = 0; i < total; i++)
        {
            for (int j = i + 1; j < total; j++)
            {
                double dist = Euclidean(pooled[i], pooled[j]);
                packed[at++] = dist;
                rowSums[i] += weights[j] * dist;
                rowSums[j] += weights[i] * dist;
                all += weights[i] * weights[j] * dist;
            }
        }

        // inX[i] = 1 when pooled row i is labelled as belonging to x; the observed labelling comes first.
        var inX = new double[total];
        Array.Fill(inX, 1.0, 0, n);
        var xMarks = new double[total];
        double observed = LabelledStatistic(packed, rowSums, all, weights, inX, xMarks);
        if (!double.IsFinite(observed))
            throw new ArgumentException("A sample's weights sum to zero or less; the weighted energy statistic is undefined.", nameof(xWeights));
        var rng = new Xoshiro256StarStar(seed, threadSafe: false);
        int asExtreme = 0;
        for (int b = 0; b < permutations; b++)
        {
            // Fisher–Yates shuffle of the labels (Knuth 1969, Algorithm P); each row keeps its weight.
            for (int i = total - 1; i > 0; i--)
            {
                int k = rng.Next(i + 1);
                (inX[i], inX[k]) = (inX[k], inX[i]);
            }
            double permuted = LabelledStatistic(packed, rowSums, all, weights, inX, xMarks);
            if (!(permuted < observed) && ++asExtreme >= stopAfter)
                return Result(observed, (double)asExtreme / (b + 1), b + 1);
        }
        return Result(observed, (1.0 + asExtreme) / (1.0 + permutations), permutations);

        EnergyDistanceResult Result(double e, double p, int done)
        {
            double nx = xWeights is null ? n : KishCount.Of(xWeights.Sum(), xWeights.Sum(w => w * w));
            double ny = yWeights is null ? m : KishCount.Of(yWeights.Sum(), yWeights.Sum(w => w * w));
            return new EnergyDistanceResult(e, TestStatistic(e, nx, ny), p, done);
        }
    }


    /// <summary>
    /// Rows with each feature shifted and scaled, (v − means[f]) / sds[f], so that no feature dominates the
    /// Euclidean distance by its units. Returns new arrays; the input is not changed.
    /// </summary>
    internal static double[][] Standardise(double[][] rows, double[] means, double[] sds)
    {
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(means);
        ArgumentNullException.ThrowIfNull(sds);
        if (means.Length != sds.Length)
            throw new ArgumentException($"{means.Length} means but {sds.Length} standard deviations.", nameof(sds));
        for (int f = 0; f < sds.Length; f++)
        {
            if (!double.IsFinite(means[f]))
                throw new ArgumentException(string.Create(CultureInfo.InvariantCulture, $"means[{f}] is {means[f]}; it must be finite."), nameof(means));
            if (!double.IsFinite(sds[f]) || !(sds[f] > 0))
                throw new ArgumentException(string.Create(CultureInfo.InvariantCulture, $"sds[{f}] is {sds[f]}; a standard deviation must be finite and positive."), nameof(sds));
        }
        var result = new double[rows.Length][];
        for (int i = 0; i < rows.Length; i++)
        {
            double[] row = rows[i];
            if (row.Length != means.Length)
                throw new ArgumentException($"rows[{i}] has {row.Length} features but {means.Length} means were given.", nameof(rows));
            var scaled = new double[row.Length];
            for (int f = 0; f < row.Length; f++) scaled[f] = (row[f] - means[f]) / sds[f];
            result[i] = scaled;
        }
        return result;
    }

    /// <summary>
    /// E for a labelling given as a 0/1 mask, each row weighted by its weight. Only the within-x pair sum needs the
    /// matrix: with vᵢ = wᵢ on x's rows and 0 elsewhere, Rᵢ the weighted row sums and S the weighted sum over all
    /// pairs, the within-y sum is S − Σᵢ vᵢRᵢ + Sxx and the cross sum follows. The pairs are visited in the same order
    /// for every labelling, so equal labellings give equal values; NaN when a side's weights sum to zero or less.
    /// </summary>
    private static double LabelledStatistic(double[] packed, double[] rowSums, double all, double[] weights, double[] inX, double[] xMarks)
    {
        int total = inX.Length;
        double wx = 0, wy = 0;
        for (int i = 0; i < total; i++)
        {
            xMarks[i] = inX[i] * weights[i];
            if (inX[i] != 0) wx += weights[i]; else wy += weights[i];
        }
        if (!(wx > 0) || !(wy > 0)) return double.NaN;
        double sxx = 0, xRowSums = 0;
        long at = 0;
        for (int i = 0; i < total; i++)
        {
            int length = total - i - 1;
            if (inX[i] != 0)
            {
                xRowSums += weights[i] * rowSums[i];
                ReadOnlySpan<double> row = packed.AsSpan((int)at, length);
                ReadOnlySpan<double> mask = xMarks.AsSpan(i + 1, length);
                sxx += weights[i] * Dot(row, mask);
            }
            at += length;
        }
        double syy = all - xRowSums + sxx;
        double sxy = all - sxx - syy;
        return EStatistic(sxy, sxx, syy, wx, wy);
    }

    /// <summary>SIMD dot product; the permutation loop spends its time here.</summary>
    private static double Dot(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var sum = Vector<double>.Zero;
        int j = 0;
        for (; j <= a.Length - Vector<double>.Count; j += Vector<double>.Count)
            sum += new Vector<double>(a.Slice(j)) * new Vector<double>(b.Slice(j));
        double s = Vector.Sum(sum);
        for (; j < a.Length; j++) s += a[j] * b[j];
        return s;
    }

    /// <summary>E from (weighted) pair sums: cross sum over all (i, j), within sums over unordered pairs i &lt; k; n and m the samples' total weights.</summary>
    private static double EStatistic(double sxy, double sxx, double syy, double nn, double mm)
    {
        return 2 * sxy / (nn * mm) - 2 * sxx / (nn * nn) - 2 * syy / (mm * mm);
    }

    private static double Euclidean(double[] a, double[] b)
    {
        double s = 0;
        for (int f = 0; f < a.Length; f++)
        {
            double d = a[f] - b[f];
            s += d * d;
        }
        return Math.Sqrt(s);
    }

    /// <summary>Checks a row set (non-empty, same width, finite values); returns the width.</summary>
    private static int RequireRows(double[][] rows, string what, int width)
    {
        ArgumentNullException.ThrowIfNull(rows, what);
        if (rows.Length == 0)
            throw new GateInputException(ErrorCodes.SampleEmpty, $"{what} has no rows; the energy distance needs at least one.");
        return KernelPreconditions.RequireRowShape(rows, what, width);
    }
}
