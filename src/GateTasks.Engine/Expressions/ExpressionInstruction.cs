namespace GateTasks.Engine.Expressions;

/// <summary>
/// One step of a compiled expression in postfix order: push a constant or a column, or replace the top
/// <see cref="OperationKernels.Arity"/> values with the result of <see cref="Operation"/>.
/// </summary>
/// <param name="Operation">What the step computes.</param>
/// <param name="Constant">The value, for <see cref="ExpressionOperation.Constant"/>.</param>
/// <param name="Column">Index into the expression's columns, for <see cref="ExpressionOperation.Column"/>.</param>
/// <param name="IsBoolean">The result is a truth value; kept through constant folding.</param>
internal readonly record struct ExpressionInstruction(ExpressionOperation Operation, double Constant, int Column, bool IsBoolean);
