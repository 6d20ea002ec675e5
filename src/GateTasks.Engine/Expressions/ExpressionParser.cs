using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Expressions;

/// <summary>
/// Recursive-descent parser that emits postfix instructions as it goes, folding constants on the way.
/// Emitting directly (no syntax tree) keeps a long left-associative chain such as a+b+c+… flat: nothing
/// recurses over it, and the evaluation stack stays two deep.
/// </summary>
/// <remarks>
/// Precedence, loosest first: ||; &amp;&amp;; comparisons (non-associative); + -; * / %;
/// prefix - + !; ^ (right-associative, and tighter than a prefix minus on its left: -2^2 = -4,
/// while 2^-1 = 0.5). Nesting (parentheses, calls, prefix operators, exponents) is limited to
/// <see cref="ExpressionCompiler.MaxDepth"/>, which bounds the parser's recursion.
/// </remarks>
internal sealed class ExpressionParser
{
    private const string OperandExpected = "a number, column, function call or '('";

    private readonly ExpressionSource _source;
    private readonly List<ExpressionToken> _tokens;
    private readonly IReadOnlyCollection<string> _available;
    private readonly HashSet<string> _availableSet;
    private readonly List<ExpressionInstruction> _program = [];
    private readonly List<string> _columns = [];
    private readonly Dictionary<string, int> _columnIndex = new(StringComparer.Ordinal);
    private int _position;
    private int _depth;
    private int _openParentheses;

    public ExpressionParser(ExpressionSource source, List<ExpressionToken> tokens, IReadOnlyCollection<string> available)
    {
        _source = source;
        _tokens = tokens;
        _available = available;
        _availableSet = new HashSet<string>(available, StringComparer.Ordinal);
    }

    /// <summary>The postfix program and the distinct columns it reads, in order of first use.</summary>
    public (ExpressionInstruction[] Program, string[] Columns) Parse()
    {
        if (Peek.Kind == ExpressionTokenKind.End) throw _source.Error(0, "empty expression");
        ParseOr();
        var rest = Peek;
        if (rest.Kind == ExpressionTokenKind.RightParenthesis)
            throw Error(rest, "unbalanced parentheses: this ')' has no matching '('");
        if (rest.Kind != ExpressionTokenKind.End)
            throw Error(rest, $"expected an operator or the end of the expression, found {rest.Describe()}");
        return ([.. _program], [.. _columns]);
    }

    private ExpressionToken Peek => _tokens[_position];

    private ExpressionToken Next() => _tokens[_position++];

    private void ParseOr()
    {
        ParseAnd();
        while (Peek.Kind == ExpressionTokenKind.Or)
        {
            Next();
            ParseAnd();
            Emit(ExpressionOperation.Or);
        }
    }

    private void ParseAnd()
    {
        ParseComparison();
        while (Peek.Kind == ExpressionTokenKind.And)
        {
            Next();
            ParseComparison();
            Emit(ExpressionOperation.And);
        }
    }

    private void ParseComparison()
    {
        ParseAdditive();
        if (ComparisonOf(Peek.Kind) is not { } operation) return;
        var first = Next();
        ParseAdditive();
        Emit(operation);
        var second = Peek;
        if (ComparisonOf(second.Kind) is not null)
            throw Error(second,
                $"comparisons cannot be chained: 'a {first.Text} b {second.Text} c' has no meaning here; " +
                $"write 'a {first.Text} b && b {second.Text} c', or add parentheses");
    }

    private void ParseAdditive()
    {
        ParseMultiplicative();
        while (Peek.Kind is ExpressionTokenKind.Plus or ExpressionTokenKind.Minus)
        {
            var operation = Next().Kind == ExpressionTokenKind.Plus ? ExpressionOperation.Add : ExpressionOperation.Subtract;
            ParseMultiplicative();
            Emit(operation);
        }
    }

    private void ParseMultiplicative()
    {
        ParseUnary();
        while (Peek.Kind is ExpressionTokenKind.Star or ExpressionTokenKind.Slash or ExpressionTokenKind.Percent)
        {
            var operation = Next().Kind switch
            {
                ExpressionTokenKind.Star => ExpressionOperation.Multiply,
                ExpressionTokenKind.Slash => ExpressionOperation.Divide,
                _ => ExpressionOperation.Remainder,
            };
            ParseUnary();
            Emit(operation);
        }
    }

    private void ParseUnary()
    {
        var kind = Peek.Kind;
        if (kind is not (ExpressionTokenKind.Minus or ExpressionTokenKind.Plus or ExpressionTokenKind.Not))
        {
            ParsePower();
            return;
        }
        Enter(Next());
        ParseUnary();
        Leave();
        if (kind == ExpressionTokenKind.Minus) Emit(ExpressionOperation.Negate);
        else if (kind == ExpressionTokenKind.Not) Emit(ExpressionOperation.Not);
        // A prefix '+' changes nothing.
    }

    private void ParsePower()
    {
        ParsePrimary();
        if (Peek.Kind != ExpressionTokenKind.Caret) return;
        Enter(Next());
        ParseUnary(); // right-associative: 2^3^2 = 2^(3^2)
        Leave();
        Emit(ExpressionOperation.Power);
    }

    private void ParsePrimary()
    {
        var token = Next();
        switch (token.Kind)
        {
            case ExpressionTokenKind.Number:
                EmitConstant(token.Number, isBoolean: false);
                return;
            case ExpressionTokenKind.LeftParenthesis:
                Enter(token);
                _openParentheses++;
                ParseOr();
                var close = Peek;
                if (close.Kind == ExpressionTokenKind.End)
                    throw Error(token, "unbalanced parentheses: this '(' is never closed");
                if (close.Kind != ExpressionTokenKind.RightParenthesis)
                    throw Error(close, $"expected ')' or an operator, found {close.Describe()}");
                Next();
                _openParentheses--;
                Leave();
                return;
            case ExpressionTokenKind.Identifier when Peek.Kind == ExpressionTokenKind.LeftParenthesis:
                ParseCall(token);
                return;
            case ExpressionTokenKind.Identifier:
                ResolveName(token);
                return;
            case ExpressionTokenKind.QuotedIdentifier when Peek.Kind == ExpressionTokenKind.LeftParenthesis:
                throw Error(token, $"{token.Describe()} is a column name in braces and cannot be called as a function");
            case ExpressionTokenKind.QuotedIdentifier:
                EmitColumn(token);
                return;
            case ExpressionTokenKind.End:
                throw Error(token, $"the expression ends too early: expected {OperandExpected}");
            case ExpressionTokenKind.RightParenthesis when _openParentheses == 0:
                throw Error(token, "unbalanced parentheses: this ')' has no matching '('");
            default:
                throw Error(token, $"expected {OperandExpected}, found {token.Describe()}");
        }
    }

    private void ResolveName(ExpressionToken token)
    {
        var name = token.Text;
        // The constant wins over a column of the same name; such a column is reachable as {pi}.
        if (name == "pi") EmitConstant(Math.PI, isBoolean: false);
        else if (_availableSet.Contains(name)) EmitColumn(token);
        else if (ExpressionFunction.TryFind(name, out _))
            throw Error(token, $"'{name}' is a function, not a value; call it with arguments, like {name}(...)");
        else throw UnknownColumn(token);
    }

    private void ParseCall(ExpressionToken nameToken)
    {
        var name = nameToken.Text;
        if (!ExpressionFunction.TryFind(name, out var function))
        {
            if (name == "pi") throw Error(nameToken, "'pi' is a constant, not a function");
            if (_availableSet.Contains(name)) throw Error(nameToken, $"'{name}' is a column, not a function");
            var names = ExpressionFunction.All.Select(f => f.Name).ToArray();
            var hint = NearestName.Hint(name, names);
            throw Error(nameToken, $"unknown function '{name}'" +
                (hint.Length > 0 ? hint : $"; the functions are {string.Join(", ", names)}"));
        }
        var open = Next();
        Enter(open);
        _openParentheses++;
        var count = 0;
        if (Peek.Kind != ExpressionTokenKind.RightParenthesis)
        {
            while (true)
            {
                ParseOr();
                count++;
                if (function.IsVariadic && count >= 2) Emit(function.Operation);
                var after = Peek;
                if (after.Kind == ExpressionTokenKind.Comma)
                {
                    Next();
                    continue;
                }
                if (after.Kind == ExpressionTokenKind.RightParenthesis) break;
                if (after.Kind == ExpressionTokenKind.End)
                    throw Error(open, $"unbalanced parentheses: the '(' of this call to {name} is never closed");
                throw Error(after, $"expected ',' or ')' in the call to {name}, found {after.Describe()}");
            }
        }
        Next();
        _openParentheses--;
        Leave();
        if (count < function.MinArguments || count > function.MaxArguments)
            throw Error(nameToken, function.ArgumentCountMessage(count));
        if (!function.IsVariadic) Emit(function.Operation);
    }

    private static ExpressionOperation? ComparisonOf(ExpressionTokenKind kind) => kind switch
    {
        ExpressionTokenKind.Less => ExpressionOperation.Less,
        ExpressionTokenKind.LessOrEqual => ExpressionOperation.LessOrEqual,
        ExpressionTokenKind.Greater => ExpressionOperation.Greater,
        ExpressionTokenKind.GreaterOrEqual => ExpressionOperation.GreaterOrEqual,
        ExpressionTokenKind.Equal => ExpressionOperation.Equal,
        ExpressionTokenKind.NotEqual => ExpressionOperation.NotEqual,
        _ => null,
    };

    private void Enter(ExpressionToken token)
    {
        if (++_depth > ExpressionCompiler.MaxDepth)
            throw Error(token,
                $"expression nested too deeply: more than {ExpressionCompiler.MaxDepth} levels of parentheses, calls, prefix operators and exponents");
    }

    private void Leave() => _depth--;

    private void EmitConstant(double value, bool isBoolean) =>
        _program.Add(new ExpressionInstruction(ExpressionOperation.Constant, value, -1, isBoolean));

    private void EmitColumn(ExpressionToken token)
    {
        var name = token.Text;
        if (!_availableSet.Contains(name)) throw UnknownColumn(token);
        if (!_columnIndex.TryGetValue(name, out var index))
        {
            index = _columns.Count;
            _columns.Add(name);
            _columnIndex.Add(name, index);
        }
        _program.Add(new ExpressionInstruction(ExpressionOperation.Column, 0, index, false));
    }

    private void Emit(ExpressionOperation operation)
    {
        var arity = OperationKernels.Arity(operation);
        var isBoolean = OperationKernels.IsBoolean(operation);
        var first = _program.Count - arity;
        // The last `arity` instructions being constants means they are exactly this operation's operands.
        var foldable = first >= 0;
        for (var k = first; foldable && k < _program.Count; k++)
            foldable = _program[k].Operation == ExpressionOperation.Constant;
        if (!foldable)
        {
            _program.Add(new ExpressionInstruction(operation, 0, -1, isBoolean));
            return;
        }
        Span<double> operands = stackalloc double[3];
        for (var k = 0; k < arity; k++) operands[k] = _program[first + k].Constant;
        Span<double> result = stackalloc double[1];
        OperationKernels.Apply(operation, operands[..1], operands.Slice(1, 1), operands.Slice(2, 1), result);
        _program.RemoveRange(first, arity);
        EmitConstant(result[0], isBoolean);
    }

    private GateInputException UnknownColumn(ExpressionToken token)
    {
        var hint = NearestName.Hint(token.Text, _available);
        var none = _available.Count == 0 ? "; no columns are available" : "";
        return Error(token, $"unknown column {token.Describe()}{hint}{none}");
    }

    private GateInputException Error(ExpressionToken token, string message) => _source.Error(token.Offset, message);
}
