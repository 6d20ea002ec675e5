namespace GateTasks.Engine.Expressions;

/// <summary>
/// A function an expression may call: its name, the operation it compiles to and how many arguments it takes.
/// A variadic function (min, max) folds its arguments pairwise with a two-operand operation.
/// </summary>
internal sealed record ExpressionFunction(string Name, ExpressionOperation Operation, int MinArguments, int MaxArguments)
{
    /// <summary>Takes any number of arguments from <see cref="MinArguments"/> on.</summary>
    public bool IsVariadic => MaxArguments == int.MaxValue;

    /// <summary>Every function, in the order messages list them. Nothing else is callable.</summary>
    public static IReadOnlyList<ExpressionFunction> All { get; } =
    [
        new("sqrt", ExpressionOperation.Sqrt, 1, 1),
        new("exp", ExpressionOperation.Exp, 1, 1),
        new("log", ExpressionOperation.Log, 1, 1),
        new("log10", ExpressionOperation.Log10, 1, 1),
        new("pow", ExpressionOperation.Power, 2, 2),
        new("abs", ExpressionOperation.Abs, 1, 1),
        new("min", ExpressionOperation.Min, 2, int.MaxValue),
        new("max", ExpressionOperation.Max, 2, int.MaxValue),
        new("sin", ExpressionOperation.Sin, 1, 1),
        new("cos", ExpressionOperation.Cos, 1, 1),
        new("tan", ExpressionOperation.Tan, 1, 1),
        new("asin", ExpressionOperation.Asin, 1, 1),
        new("acos", ExpressionOperation.Acos, 1, 1),
        new("atan", ExpressionOperation.Atan, 1, 1),
        new("atan2", ExpressionOperation.Atan2, 2, 2),
        new("sinh", ExpressionOperation.Sinh, 1, 1),
        new("cosh", ExpressionOperation.Cosh, 1, 1),
        new("tanh", ExpressionOperation.Tanh, 1, 1),
        new("floor", ExpressionOperation.Floor, 1, 1),
        new("ceil", ExpressionOperation.Ceiling, 1, 1),
        new("round", ExpressionOperation.Round, 1, 1),
        new("if", ExpressionOperation.Conditional, 3, 3),
        new("isnan", ExpressionOperation.IsNan, 1, 1),
    ];

    private static readonly Dictionary<string, ExpressionFunction> ByName =
        All.ToDictionary(f => f.Name, StringComparer.Ordinal);

    /// <summary>The function spelled exactly <paramref name="name"/> (names are case-sensitive).</summary>
    public static bool TryFind(string name, out ExpressionFunction function) =>
        ByName.TryGetValue(name, out function!);

    /// <summary>"atan2 takes 2 arguments, got 3".</summary>
    public string ArgumentCountMessage(int given) =>
        IsVariadic
            ? $"{Name} takes at least {MinArguments} arguments, got {given}"
            : $"{Name} takes {MinArguments} argument{(MinArguments == 1 ? "" : "s")}, got {given}";
}
