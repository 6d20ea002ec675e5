using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Expressions;

namespace GateTasks.Engine.Samples;

/// <summary>
/// Where each feature's values come from — a column, or a derived-feature expression over columns — and the
/// contract's selection, compiled against the columns a sample has. Expressions are compiled once per pass.
/// </summary>
internal sealed class FeatureSources
{
    private FeatureSources(IReadOnlyList<string?> columns, IReadOnlyList<CompiledExpression?> expressions, CompiledExpression? selection,
        IReadOnlyList<CompiledExpression?> conditions, IReadOnlyList<CompiledCategory?> categories)
    {
        Categories = categories;
        FeatureColumns = columns;
        Expressions = expressions;
        Selection = selection;
        Conditions = conditions;
    }

    /// <summary>Per feature: a condition of its own (a category of a category block), or null.</summary>
    public IReadOnlyList<CompiledExpression?> Conditions { get; }

    /// <summary>Per feature: a category's condition in its parts (the same rows as its <see cref="Conditions"/> entry), or null.</summary>
    public IReadOnlyList<CompiledCategory?> Categories { get; }

    /// <summary>Per feature: its column, or null for a derived feature.</summary>
    public IReadOnlyList<string?> FeatureColumns { get; }

    /// <summary>Per feature: its compiled expression, or null for a column.</summary>
    public IReadOnlyList<CompiledExpression?> Expressions { get; }

    /// <summary>The selection every event must pass before filling, or null.</summary>
    public CompiledExpression? Selection { get; }

    public int Count => FeatureColumns.Count;

    /// <summary>Every sample column the pass must read (features, expressions, selection), in first-use order.</summary>
    public IReadOnlyList<string> RequiredColumns =>
        FeatureColumns.Where(c => c is not null).Select(c => c!)
            .Concat(Expressions.Where(e => e is not null).SelectMany(e => e!.Columns))
            .Concat(Selection?.Columns ?? [])
            .Concat(Conditions.Where(c => c is not null).SelectMany(c => c!.Columns))
            .Distinct(StringComparer.Ordinal).ToList();

    public static FeatureSources Compile(PrecisionContract contract, IReadOnlyCollection<string> available)
    {
        var columns = new List<string?>();
        var expressions = new List<CompiledExpression?>();
        var conditions = new List<CompiledExpression?>();
        var categories = new List<CompiledCategory?>();
        foreach (var f in contract.Features)
        {
            conditions.Add(f.Condition is { } condition ? ExpressionCompiler.Compile(condition.Text, available, condition.Location) : null);
            categories.Add(f is { Condition: { } at, Category: { } category }
                ? new CompiledCategory(ExpressionCompiler.Compile(category.By, available, at.Location), category.Value) : null);
            if (f.Expression is { } text)
            {
                var compiled = ExpressionCompiler.Compile(text, available, f.ColumnLocation);
                if (compiled.IsBoolean && f.Kind == FeatureKind.Continuous)
                    throw new GateInputException(ErrorCodes.ContractExpression,
                        $"Feature '{f.Name}' is a condition (true/false); declare it 'kind: discrete' to compare its two fractions.", f.ColumnLocation);
                columns.Add(null);
                expressions.Add(compiled);
            }
            else
            {
                columns.Add(f.Column);
                expressions.Add(null);
            }
        }
        CompiledExpression? selection = null;
        if (contract.Selection is { } s)
        {
            selection = ExpressionCompiler.Compile(s.Text, available, s.Location);
            if (!selection.IsBoolean)
                throw new GateInputException(ErrorCodes.ContractExpression,
                    "The selection must be a condition (a comparison, 'and', 'or', 'not' or isnan), not a number.", s.Location);
        }
        return new FeatureSources(columns, expressions, selection, conditions, categories);
    }
}
