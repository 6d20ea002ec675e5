using GateTasks.Engine.Expressions;

namespace GateTasks.Engine.Samples;

/// <summary>A category's condition compiled in its parts: the rows whose <see cref="By"/> evaluates to <see cref="Value"/>.</summary>
internal sealed record CompiledCategory(CompiledExpression By, double Value);
