namespace GateTasks.Engine.Checks;

/// <summary>
/// One part of an effect (a bin of a region, a quantile, a single moment, a category's fraction): its non-negative
/// deviation and the reference and sample parts of its normal standard error, as measured on the sample's events.
/// Kept so that the events needed to decide can be solved after the contract-wide decision (<see cref="NeededEvents"/>).
/// </summary>
internal readonly record struct EffectPart(double Deviation, double SeReference, double SeSample);
