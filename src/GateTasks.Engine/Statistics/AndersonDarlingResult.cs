namespace GateTasks.Engine.Statistics;

/// <summary>
/// k-sample Anderson–Darling result (Scholz &amp; Stephens 1987): A²kN (continuous version, eq. 7 with ties
/// at distinct values), A²akN (tie-adjusted version), σ_N, the standardised T = (A² − (k−1))/σ_N for both,
/// and their asymptotic p-values. <c>Extrapolated</c> is true when a p-value lies outside the tabulated
/// range [0.01, 0.25] and came from linear extrapolation.
/// </summary>
internal readonly record struct AndersonDarlingResult(
    double A2kN,
    double A2akN,
    double Sigma,
    double TkN,
    double TakN,
    double PValueKN,
    double PValueAkN,
    bool ExtrapolatedKN,
    bool ExtrapolatedAkN);
