using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// A region of a feature declared by name: an explicit value range [lower, upper], or a range between two
/// reference quantiles (<see cref="ByQuantile"/>). A bin belongs to it when its centre lies in the range.
/// </summary>
internal sealed record NamedRegion(string Name, double Lower, double Upper, bool ByQuantile, SourceLocation Location);
