using GateTasks.Engine.Histograms;

namespace GateTasks.Engine.Accumulation;

/// <summary>
/// What a sample's accumulation takes from one feature of the reference: the reference histogram, whose axis the
/// sample fills and whose marginal CDF ranks the feature's values for Spearman's ρ, and the thresholds of its far
/// tails (null when the reference counts none), and the edges of its fine grid (null when it keeps none: the feature
/// has no Wasserstein check).
/// </summary>
internal sealed record FeatureLayout(Histogram Reference, (double Low, double High)? FarTail, double[]? FineEdges = null);
