using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Contracts;

/// <summary>A condition every event must meet before it is filled (reference and sample alike), with where its text starts.</summary>
internal sealed record SelectionSpec(string Text, SourceLocation Location);
