namespace GateTasks.Engine.Contracts;

/// <summary>
/// The comparisons a contract can ask for. Each has a key in the contract and a drift error code. Most bound an
/// effect size by a tolerance; the goodness-of-fit tests (<see cref="ChiSquareTest"/>, <see cref="KolmogorovSmirnovTest"/>)
/// have no tolerance and fail only when their p-value is significant at the contract's family-wise level.
/// </summary>
internal enum CheckKind
{
    /// <summary>Largest distance between the binned cumulative distributions (Kolmogorov–Smirnov statistic).</summary>
    KolmogorovSmirnov,

    /// <summary>Wasserstein-1 distance divided by the reference's standard deviation.</summary>
    Wasserstein,

    /// <summary>χ² homogeneity test of the two histograms (a goodness-of-fit test in the contract's family).</summary>
    ChiSquareTest,

    /// <summary>Kolmogorov–Smirnov two-sample test on the binned distributions (a goodness-of-fit test in the family).</summary>
    KolmogorovSmirnovTest,

    /// <summary>Anderson–Darling two-sample test on the binned distributions (a goodness-of-fit test in the family).</summary>
    AndersonDarlingTest,

    /// <summary>Cramér–von Mises two-sample test on the binned distributions (a goodness-of-fit test in the family).</summary>
    CramerVonMisesTest,

    /// <summary>Largest |surrogate/reference − 1| of the normalised bin contents in one region.</summary>
    BinRatio,

    /// <summary>Jensen–Shannon divergence of the normalised bin contents.</summary>
    JensenShannon,

    /// <summary>|mean difference| in units of the reference's standard deviation.</summary>
    MeanShift,

    /// <summary>|σ_surrogate/σ_reference − 1|: a width (resolution) change.</summary>
    WidthRatio,

    /// <summary>Largest shift of the core's bounding quantiles and the median, in units of σ_reference.</summary>
    QuantileShift,

    /// <summary>|IQR_surrogate/IQR_reference − 1|: a robust width (resolution) change.</summary>
    InterquartileWidthRatio,

    /// <summary>Largest |Δ fraction| beyond the reference's 0.1% and 99.9% quantiles.</summary>
    FarTail,

    /// <summary>χ² homogeneity test of a declared pair's 2-D histograms (a goodness-of-fit test in the family).</summary>
    ChiSquare2DTest,

    /// <summary>Fréchet distance between Gaussian fits of the standardised joint feature set, extrapolated to infinite size.</summary>
    FrechetDistance,
    /// <summary>Unbiased squared maximum mean discrepancy of the standardised joint feature set, cubic polynomial kernel.</summary>
    KernelDistance,
    /// <summary>Kolmogorov–Smirnov distance of the standardised joint feature set's K projections, worst or mean over them.</summary>
    SlicedKolmogorovSmirnov,
    /// <summary>Wasserstein-1 distance (in the reference's projected σ) of the joint feature set's K projections, worst or mean.</summary>
    SlicedWasserstein,
    /// <summary>|Δ Pearson r| of a declared pair of features.</summary>
    PearsonDifference,

    /// <summary>|Δ Spearman ρ| of a declared pair of features.</summary>
    SpearmanDifference,

    /// <summary>Largest |Δ fraction|: of the declared spike (continuous), or of any category (discrete).</summary>
    Fraction,
}
