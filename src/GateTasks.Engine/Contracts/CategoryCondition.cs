namespace GateTasks.Engine.Contracts;

/// <summary>
/// A category block's condition in its parts: the events whose <see cref="By"/> (a column or an expression) equals
/// <see cref="Value"/>. The same condition as text (<c>(by) == value</c>) is the feature's <see cref="FeatureSpec.Condition"/>;
/// the parts let one pass sort a batch's rows into every category of a block at once.
/// </summary>
internal sealed record CategoryCondition(string By, double Value);
