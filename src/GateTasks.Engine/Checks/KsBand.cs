namespace GateTasks.Engine.Checks;

/// <summary>
/// What a ks-max check's distribution-free band was made of, for sizing it when undecided: the observed distance and
/// the effective counts of the two CDFs (the band's half-width is √(ln(4/α)/2)·(1/√n₁ + 1/√n₂), DKW with Massart's constant).
/// </summary>
/// <param name="Distance">The observed binned Kolmogorov–Smirnov distance.</param>
/// <param name="ReferenceEffective">The reference CDF's effective count.</param>
/// <param name="SampleEffective">The sample CDF's effective count, which grows in proportion to the sample's events.</param>
internal sealed record KsBand(double Distance, double ReferenceEffective, double SampleEffective);
