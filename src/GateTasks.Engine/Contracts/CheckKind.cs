namespace GateTasks.Engine.Contracts;

/// <summary>The comparisons a contract can ask for. Each has a key in the contract and a drift error code.</summary>
internal enum CheckKind
{
    /// <summary>Largest distance between the binned cumulative distributions (Kolmogorov–Smirnov statistic).</summary>
    KolmogorovSmirnov,

    /// <summary>Wasserstein-1 distance divided by the reference's standard deviation.</summary>
    Wasserstein,

    /// <summary>Floor on the χ² homogeneity p-value of the two histograms.</summary>
    ChiSquare,

    /// <summary>Largest |surrogate/reference − 1| of the normalised bin contents in one region.</summary>
    BinRatio,

    /// <summary>Jensen–Shannon divergence of the normalised bin contents.</summary>
    JensenShannon,
}
