namespace GateTasks.Engine.Expressions;

/// <summary>
/// A parsed, checked expression ready to evaluate over batches of rows. It can read only the columns it was
/// compiled against and compute only the listed operations: there is nothing else it could reach.
/// </summary>
/// <remarks>
/// Evaluation is column-wise: each postfix step runs over the whole batch into a scratch buffer. The buffers
/// belong to the instance and are reused, growing only for a larger batch, so evaluating allocates nothing per
/// row or per call. Work is O(steps × rows). Not thread-safe (the buffers are shared state).
/// </remarks>
internal sealed class CompiledExpression
{
    private readonly ExpressionInstruction[] _program;
    // The evaluation-stack slot each step writes; its operands sit in the slots just above.
    private readonly int[] _slots;
    private readonly double[][] _scratch;

    public CompiledExpression(string text, ExpressionInstruction[] program, string[] columns)
    {
        if (program.Length == 0) throw new ArgumentException("an expression has at least one step", nameof(program));
        Text = text;
        Columns = columns;
        _program = program;
        _slots = new int[program.Length];
        var depth = 0;
        var maxDepth = 0;
        for (var k = 0; k < program.Length; k++)
        {
            depth -= OperationKernels.Arity(program[k].Operation);
            if (depth < 0) throw new ArgumentException("the program takes more values than it pushed", nameof(program));
            _slots[k] = depth;
            maxDepth = Math.Max(maxDepth, ++depth);
        }
        if (depth != 1) throw new ArgumentException("the program must leave exactly one value", nameof(program));
        _scratch = new double[maxDepth][];
        for (var s = 0; s < maxDepth; s++) _scratch[s] = [];
    }

    /// <summary>The expression as written in the contract.</summary>
    public string Text { get; }

    /// <summary>The distinct columns the expression reads, in order of first use.</summary>
    public IReadOnlyList<string> Columns { get; }

    /// <summary>The result is a truth value (1.0 or 0.0): the top operation is a comparison, and/or, not or isnan.</summary>
    public bool IsBoolean => _program[^1].IsBoolean;

    /// <summary>
    /// Evaluates the first <paramref name="rows"/> rows. <paramref name="columns"/>[i] holds the values of
    /// <see cref="Columns"/>[i] for the batch (length at least <paramref name="rows"/>); the results go to the
    /// first <paramref name="rows"/> elements of <paramref name="output"/>.
    /// </summary>
    public void Evaluate(IReadOnlyList<double[]> columns, int rows, Span<double> output)
    {
        ArgumentNullException.ThrowIfNull(columns);
        ArgumentOutOfRangeException.ThrowIfNegative(rows);
        if (columns.Count < Columns.Count)
            throw new ArgumentException($"the expression reads {Columns.Count} columns, {columns.Count} were given", nameof(columns));
        for (var i = 0; i < Columns.Count; i++)
        {
            if (columns[i] is null || columns[i].Length < rows)
                throw new ArgumentException($"column '{Columns[i]}' holds fewer than {rows} values", nameof(columns));
        }
        if (output.Length < rows) throw new ArgumentException($"the output holds fewer than {rows} values", nameof(output));
        if (rows == 0) return;

        if (_scratch[0].Length < rows)
        {
            for (var s = 0; s < _scratch.Length; s++) _scratch[s] = new double[rows];
        }

        for (var k = 0; k < _program.Length; k++)
        {
            var step = _program[k];
            var slot = _slots[k];
            var result = _scratch[slot].AsSpan(0, rows);
            switch (step.Operation)
            {
                case ExpressionOperation.Constant:
                    result.Fill(step.Constant);
                    break;
                case ExpressionOperation.Column:
                    columns[step.Column].AsSpan(0, rows).CopyTo(result);
                    break;
                default:
                    var arity = OperationKernels.Arity(step.Operation);
                    OperationKernels.Apply(step.Operation, result,
                        arity >= 2 ? _scratch[slot + 1].AsSpan(0, rows) : default,
                        arity >= 3 ? _scratch[slot + 2].AsSpan(0, rows) : default,
                        result);
                    break;
            }
        }
        _scratch[0].AsSpan(0, rows).CopyTo(output);
    }

    /// <inheritdoc/>
    public override string ToString() => Text;
}
