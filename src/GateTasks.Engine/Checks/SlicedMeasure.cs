namespace GateTasks.Engine.Checks;

/// <summary>The one-dimensional distance a sliced comparison takes on each projection.</summary>
internal enum SlicedMeasure
{
    /// <summary>The Kolmogorov–Smirnov distance max |F − G| between the projected CDFs (at the grid's edges).</summary>
    KolmogorovSmirnov,

    /// <summary>The Wasserstein-1 distance ∫|F − G| between the projected CDFs, over the reference's projected σ.</summary>
    Wasserstein,
}

/// <summary>How a sliced comparison sums its K projections up.</summary>
internal enum SlicedSummary
{
    /// <summary>The largest over the projections (the max-sliced form; Deshpande et al. 2019).</summary>
    Worst,

    /// <summary>The mean over the projections (the sliced form, a Monte Carlo estimate of the integral over the sphere; Bonneel et al. 2015).</summary>
    Mean,
}
