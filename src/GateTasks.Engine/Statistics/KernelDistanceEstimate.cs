namespace GateTasks.Engine.Statistics;

/// <summary>
/// The unbiased squared maximum mean discrepancy of <see cref="UnbiasedKernelDistance"/> between two row sets, on all
/// rows and on B seeded blocks.
/// </summary>
/// <param name="FullSample">
/// MMD²ᵤ on every row of both sets (with <paramref name="FromFeatureMap"/> false: the mean of the block estimates, see there).
/// </param>
/// <param name="BlockEstimates">MMD²ᵤ between block b of the first set and block b of the second, b = 0 … B−1.</param>
/// <param name="BlockMean">The mean of <paramref name="BlockEstimates"/>.</param>
/// <param name="BlockStandardDeviation">The sample standard deviation (divisor B − 1) of <paramref name="BlockEstimates"/>.</param>
/// <param name="BlockStandardError">
/// <paramref name="BlockStandardDeviation"/>/√B: the standard error of <paramref name="BlockMean"/> (the blocks are
/// disjoint, so their estimates are independent). As a standard error of <paramref name="FullSample"/> it is right
/// when the two laws differ and conservative when they agree: a U-statistic with a non-degenerate kernel has variance
/// of order 1/n (Hoeffding 1948; Serfling 1980, "Approximation theorems of mathematical statistics", §5.5), so the
/// full sample's is about the block variance / B; under equal laws MMD²ᵤ is degenerate, its variance is of order 1/n²
/// (Gretton et al. 2012, JMLR 13:723, §5.3 and Thm. 12) and the full sample's standard deviation is about
/// <paramref name="BlockStandardDeviation"/>/B, √B times smaller than this value.
/// </param>
/// <param name="FromFeatureMap">
/// True when every estimate was computed through the kernel's feature map (rows of at most
/// <see cref="UnbiasedKernelDistance.MaxFeatureMapWidth"/> features). False for wider rows: each block estimate is then
/// the mean of direct estimates on sub-blocks of <paramref name="SubBlockRows"/> rows a side and
/// <paramref name="FullSample"/> equals <paramref name="BlockMean"/> (still unbiased, with a larger variance; the
/// block-averaged statistic of Zaremba, Gretton &amp; Blaschko 2013, "B-test", NeurIPS), and
/// <paramref name="BlockStandardError"/> is its standard error in either case.
/// </param>
/// <param name="SubBlockRows">The largest sub-block a side when <paramref name="FromFeatureMap"/> is false; 0 otherwise.</param>
internal sealed record KernelDistanceEstimate(
    double FullSample,
    IReadOnlyList<double> BlockEstimates,
    double BlockMean,
    double BlockStandardDeviation,
    double BlockStandardError,
    bool FromFeatureMap,
    int SubBlockRows);
