using GateTasks.Engine.Expressions;

namespace GateTasks.Engine.Tests.Expressions;

/// <summary>
/// Every error kind: code GATE1009 and the caret on the offending token (start column 20 plus the token's
/// 0-based offset, counted by hand in each case).
/// </summary>
public class ExpressionErrorTests
{
    private static readonly string[] Columns = ["pt", "eta", "phi", "met"];

    [Fact]
    public void Unexpected_character_names_it()
    {
        var e = ExpressionRun.Error("pt # 2", Columns);
        ExpressionRun.AssertAt(e, 3);
        Assert.Contains("unexpected character '#'", e.Message);
        Assert.Equal("contract.yaml(12,23): error GATE1009: unexpected character '#' (U+0023)", e.ToDiagnosticLine());
    }

    [Fact]
    public void Unexpected_token_says_what_was_expected()
    {
        var twoOperators = ExpressionRun.Error("pt * * 2", Columns);
        ExpressionRun.AssertAt(twoOperators, 5);
        Assert.Contains("expected a number, column, function call or '(', found '*'", twoOperators.Message);

        var twoOperands = ExpressionRun.Error("pt eta", Columns);
        ExpressionRun.AssertAt(twoOperands, 3);
        Assert.Contains("expected an operator or the end of the expression, found 'eta'", twoOperands.Message);

        var endsEarly = ExpressionRun.Error("pt +", Columns);
        ExpressionRun.AssertAt(endsEarly, 4); // just past the end
        Assert.Contains("ends too early", endsEarly.Message);

        var badSeparator = ExpressionRun.Error("max(pt eta)", Columns);
        ExpressionRun.AssertAt(badSeparator, 7);
        Assert.Contains("expected ',' or ')' in the call to max, found 'eta'", badSeparator.Message);

        var malformed = ExpressionRun.Error("2pi", Columns);
        ExpressionRun.AssertAt(malformed, 0);
        Assert.Contains("malformed number '2pi'", malformed.Message);
    }

    [Fact]
    public void Unbalanced_parentheses_point_at_the_lonely_one()
    {
        var unclosed = ExpressionRun.Error("(pt + 1", Columns);
        ExpressionRun.AssertAt(unclosed, 0);
        Assert.Contains("unbalanced parentheses: this '(' is never closed", unclosed.Message);

        var extra = ExpressionRun.Error("pt + 1)", Columns);
        ExpressionRun.AssertAt(extra, 6);
        Assert.Contains("unbalanced parentheses: this ')' has no matching '('", extra.Message);

        var unclosedCall = ExpressionRun.Error("2 * sqrt(pt", Columns);
        ExpressionRun.AssertAt(unclosedCall, 8);
        Assert.Contains("never closed", unclosedCall.Message);

        var inner = ExpressionRun.Error("((pt) + 1", Columns);
        ExpressionRun.AssertAt(inner, 0);
    }

    [Fact]
    public void Unknown_function_suggests_the_nearest_one()
    {
        var e = ExpressionRun.Error("2 * sqr(pt)", Columns);
        ExpressionRun.AssertAt(e, 4);
        Assert.Equal("unknown function 'sqr' (did you mean 'sqrt'?)", e.Message);

        var uppercase = ExpressionRun.Error("COSH(eta)", Columns); // names are case-sensitive
        Assert.Equal("unknown function 'COSH' (did you mean 'cosh'?)", uppercase.Message);

        var farOff = ExpressionRun.Error("integrate(pt)", Columns);
        Assert.StartsWith("unknown function 'integrate'; the functions are sqrt, exp, log, log10, pow, abs, min, max,", farOff.Message);
    }

    [Fact]
    public void Wrong_argument_count_says_how_many()
    {
        var e = ExpressionRun.Error("1 + atan2(pt, eta, phi)", Columns);
        ExpressionRun.AssertAt(e, 4);
        Assert.Equal("atan2 takes 2 arguments, got 3", e.Message);
        Assert.Equal("sqrt takes 1 argument, got 0", ExpressionRun.Error("sqrt()", Columns).Message);
        Assert.Equal("if takes 3 arguments, got 2", ExpressionRun.Error("if(pt > 1, 2)", Columns).Message);
        Assert.Equal("min takes at least 2 arguments, got 1", ExpressionRun.Error("min(pt)", Columns).Message);
    }

    [Fact]
    public void Unknown_column_suggests_the_nearest_one()
    {
        var e = ExpressionRun.Error("eta < 2 && ptt > 20", Columns);
        ExpressionRun.AssertAt(e, 11);
        Assert.Equal("unknown column 'ptt' (did you mean 'pt'?)", e.Message);

        var quoted = ExpressionRun.Error("{mett} > 1", Columns);
        ExpressionRun.AssertAt(quoted, 0);
        Assert.Equal("unknown column {mett} (did you mean 'met'?)", quoted.Message);

        var noColumns = ExpressionRun.Error("x + 1");
        Assert.Equal("unknown column 'x'; no columns are available", noColumns.Message);
    }

    [Fact]
    public void Too_long_is_reported_at_the_start()
    {
        var e = ExpressionRun.Error(new string('1', ExpressionCompiler.MaxLength + 1), Columns);
        ExpressionRun.AssertAt(e, 0);
        Assert.Equal("expression too long: 10001 characters, the limit is 10000", e.Message);
    }

    [Fact]
    public void Nested_too_deeply_is_reported_at_the_first_level_too_many()
    {
        var text = new string('(', 65) + "pt" + new string(')', 65);
        var e = ExpressionRun.Error(text, Columns);
        ExpressionRun.AssertAt(e, 64); // the 65th '('
        Assert.Contains("nested too deeply", e.Message);

        var calls = string.Concat(Enumerable.Repeat("abs(", 65)) + "pt" + new string(')', 65);
        ExpressionRun.AssertAt(ExpressionRun.Error(calls, Columns), 64 * 4 + 3); // the '(' of the 65th abs
    }

    [Fact]
    public void Comparison_chaining_is_refused_at_the_second_operator()
    {
        var e = ExpressionRun.Error("0 < pt < 5", Columns);
        ExpressionRun.AssertAt(e, 7);
        Assert.StartsWith("comparisons cannot be chained", e.Message);
        Assert.Contains("write 'a < b && b < c'", e.Message);
        ExpressionRun.AssertAt(ExpressionRun.Error("pt == eta == phi", Columns), 10);
    }

    [Fact]
    public void Empty_expression_is_an_error()
    {
        ExpressionRun.AssertAt(ExpressionRun.Error("", Columns), 0);
        var blank = ExpressionRun.Error("   \t ", Columns);
        ExpressionRun.AssertAt(blank, 0);
        Assert.Equal("empty expression", blank.Message);
    }

    [Fact]
    public void Unknown_start_column_stays_unknown()
    {
        var start = new GateTasks.Engine.Diagnostics.SourceLocation("contract.yaml", 3);
        var e = Assert.Throws<GateTasks.Engine.Diagnostics.GateInputException>(() => ExpressionCompiler.Compile("pt +", Columns, start));
        Assert.Equal(0, e.Location!.Column);
        Assert.Equal(3, e.Location.Line);
    }
}
