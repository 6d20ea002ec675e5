using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>The surrogate sample to check: a file, folder or glob (relative to the contract) and an optional weight column.</summary>
internal sealed record SampleSpec(string Path, SourceLocation PathLocation, string? Weight, SourceLocation? WeightLocation);
