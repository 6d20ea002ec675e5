namespace GateTasks.Engine.Statistics;

/// <summary>
/// A Fréchet distance between a reference and a sample (<see cref="FrechetExtrapolation"/>): the plain value on every
/// event, the value extrapolated to infinite size with its jackknife standard error, and the points of the fit.
/// </summary>
/// <param name="Raw">FD between the fits of all events (biased upwards by finite size).</param>
/// <param name="Extrapolated">The intercept of the least-squares line FD = FD∞ + slope·x at x = 0; can be negative,
/// as an unbiased estimate of a non-negative quantity must sometimes be. NaN when there are not two usable points.</param>
/// <param name="Slope">The fitted finite-size coefficient of x.</param>
/// <param name="StandardError">Delete-one-block jackknife standard error of <paramref name="Extrapolated"/>;
/// infinite when some block cannot be left out (a subset without a defined fit).</param>
/// <param name="Points">For each subset size j = 1..B (blocks), the mean over the B cyclic windows of j consecutive
/// blocks of x = 1/n_ref + 1/n_sample (Kish effective counts of the window on each side) and of the FD between the
/// window's fits; NaN where some window has no defined fit.</param>
internal sealed record FrechetEstimate(
    double Raw,
    double Extrapolated,
    double Slope,
    double StandardError,
    IReadOnlyList<(double InverseSize, double Distance)> Points);
