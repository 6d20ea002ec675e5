using GateTasks.Engine.Expressions;

namespace GateTasks.Engine.Tests.Expressions;

public class ExpressionSemanticsTests
{
    [Theory]
    // Precedence and associativity, [exact, hand-computed] unless another source is named.
    [InlineData("1 + 2*3", 7.0)]                 // * before +
    [InlineData("(1+2)*3", 9.0)]                 // parentheses first
    [InlineData("-2^2", -4.0)]                   // ^ binds tighter than a prefix minus: -(2^2), as in maths notation
    [InlineData("(-2)^2", 4.0)]
    [InlineData("2^3^2", 512.0)]                 // right-associative: 2^(3^2) = 2^9
    [InlineData("(2^3)^2", 64.0)]
    [InlineData("2^-1", 0.5)]                    // a prefix minus in the exponent
    [InlineData("-2^-2", -0.25)]
    [InlineData("10 - 4 - 3", 3.0)]              // left-associative: (10-4)-3
    [InlineData("100 / 10 / 5", 2.0)]            // (100/10)/5
    [InlineData("2*3 % 4", 2.0)]                 // same level, left to right: (2*3)%4 = 6%4
    [InlineData("- - 3", 3.0)]
    [InlineData("+3", 3.0)]
    [InlineData("1.5e2 + .5 + 2.", 152.5)]       // literal forms: exponent, leading dot, trailing dot
    [InlineData("1E-3*1000", 1.0)]
    [InlineData("2*pi", 2 * Math.PI)]            // pi is Math.PI
    // Comparisons, [exact, hand-computed]; arithmetic binds tighter than comparison.
    [InlineData("1 + 1 < 3", 1.0)]
    [InlineData("2 <= 2", 1.0)]
    [InlineData("3 > 3", 0.0)]
    [InlineData("3 >= 3", 1.0)]
    [InlineData("0.5 == 1/2", 1.0)]
    [InlineData("1 != 1", 0.0)]
    [InlineData("(1 < 2) == 1", 1.0)]            // a parenthesised comparison may be compared again
    // Logic on 0/1 values: truth tables [exact, hand-computed]; && binds tighter than ||.
    [InlineData("0 && 0", 0.0)]
    [InlineData("0 && 1", 0.0)]
    [InlineData("1 && 0", 0.0)]
    [InlineData("1 && 1", 1.0)]
    [InlineData("0 || 0", 0.0)]
    [InlineData("0 || 1", 1.0)]
    [InlineData("1 || 0", 1.0)]
    [InlineData("1 || 1", 1.0)]
    [InlineData("1 || 1 && 0", 1.0)]             // 1 || (1 && 0); (1 || 1) && 0 would be 0
    [InlineData("2 && -3", 1.0)]                 // any non-zero value is true; the result is 1.0
    [InlineData("!0", 1.0)]
    [InlineData("!2", 0.0)]
    [InlineData("!1 + 1", 1.0)]                  // prefix ! binds like prefix minus: (!1) + 1
    [InlineData("1 < 2 && 3 < 2", 0.0)]
    [InlineData("1 < 2 || 3 < 2", 1.0)]
    [InlineData("if(1, 10, 20)", 10.0)]
    [InlineData("if(0, 10, 20)", 20.0)]
    [InlineData("if(-0.5, 10, 20)", 10.0)]
    // Remainder: C# %, truncated division with the sign of the dividend (C# spec, remainder operator; C fmod).
    [InlineData("7 % 3", 1.0)]
    [InlineData("-7 % 3", -1.0)]
    [InlineData("7 % -3", 1.0)]
    [InlineData("5.5 % 2", 1.5)]
    // floor/ceil [exact, hand-computed]; round is Math.Round's default, ties to even (IEEE 754 roundTiesToEven).
    [InlineData("floor(-1.5)", -2.0)]
    [InlineData("ceil(-1.5)", -1.0)]
    [InlineData("floor(2.7)", 2.0)]
    [InlineData("ceil(2.1)", 3.0)]
    [InlineData("round(2.5)", 2.0)]              // ties to even, not away from zero (which would give 3)
    [InlineData("round(3.5)", 4.0)]
    [InlineData("round(-2.5)", -2.0)]
    [InlineData("round(0.5)", 0.0)]
    [InlineData("round(2.6)", 3.0)]
    // Functions at points with exact values [exact, hand-computed].
    [InlineData("sqrt(16)", 4.0)]
    [InlineData("exp(0)", 1.0)]
    [InlineData("log(1)", 0.0)]
    [InlineData("log10(1000)", 3.0)]
    [InlineData("pow(2, 10)", 1024.0)]
    [InlineData("abs(-3.25)", 3.25)]
    [InlineData("min(3, 1, 2)", 1.0)]
    [InlineData("max(3, 1, 2, -8)", 3.0)]
    [InlineData("sin(0) + cos(0)", 1.0)]
    [InlineData("sinh(0) + cosh(0) + tanh(0)", 1.0)]
    [InlineData("acos(-1)", Math.PI)]
    [InlineData("asin(1)", Math.PI / 2)]
    [InlineData("atan(1)", Math.PI / 4)]
    [InlineData("atan2(1, -1)", 3 * Math.PI / 4)]  // atan2(y, x): the point (−1, 1) is at 135°
    [InlineData("atan2(-1, 0)", -Math.PI / 2)]
    [InlineData("isnan(0/0)", 1.0)]              // IEEE 754: 0/0 is NaN
    [InlineData("isnan(1/0)", 0.0)]
    [InlineData("1/0", double.PositiveInfinity)] // IEEE 754 division by zero
    [InlineData("-1/0", double.NegativeInfinity)]
    public void Constant_expressions_have_the_documented_values(string text, double expected)
    {
        Assert.Equal(expected, ExpressionRun.Scalar(text), 1e-15);
    }

    [Theory]
    // C# Math, the same library call, at points without a short exact value.
    [InlineData("tan(pi/4)", "tan")]
    [InlineData("exp(2.5)", "exp")]
    [InlineData("log(7)", "log")]
    [InlineData("cosh(0.8) - cos(2.8)", "mass")]
    public void Transcendental_functions_are_the_CSharp_Math_ones(string text, string which)
    {
        var expected = which switch
        {
            "tan" => Math.Tan(Math.PI / 4),
            "exp" => Math.Exp(2.5),
            "log" => Math.Log(7),
            _ => Math.Cosh(0.8) - Math.Cos(2.8),
        };
        Assert.Equal(expected, ExpressionRun.Scalar(text)); // C# System.Math
    }

    [Fact]
    public void NaN_makes_comparisons_false_conditionals_NaN_and_propagates_through_min_and_max()
    {
        double[] x = [double.NaN, 0.5];
        // Rules chosen for this language (documented on OperationKernels), checked on a NaN row and a number row:
        Assert.Equal([0.0, 1.0], ExpressionRun.Evaluate("x < 1", ("x", x)));
        Assert.Equal([0.0, 0.0], ExpressionRun.Evaluate("x > 1", ("x", x)));
        Assert.Equal([0.0, 1.0], ExpressionRun.Evaluate("x == x", ("x", x)));     // IEEE 754: NaN ≠ NaN
        Assert.Equal([0.0, 1.0], ExpressionRun.Evaluate("x != 1", ("x", x)));     // false for NaN, unlike IEEE's unordered ≠
        Assert.Equal([0.0, 0.0], ExpressionRun.Evaluate("x != x", ("x", x)));
        Assert.Equal([0.0, 1.0], ExpressionRun.Evaluate("x && 1", ("x", x)));    // NaN counts as false in logic
        Assert.Equal([1.0, 1.0], ExpressionRun.Evaluate("x || 1", ("x", x)));
        Assert.Equal([1.0, 0.0], ExpressionRun.Evaluate("!x", ("x", x)));
        Assert.Equal([1.0, 0.0], ExpressionRun.Evaluate("isnan(x)", ("x", x)));
        var conditional = ExpressionRun.Evaluate("if(x, 10, 20)", ("x", x));
        Assert.True(double.IsNaN(conditional[0]));                                 // NaN condition → NaN
        Assert.Equal(10.0, conditional[1]);
        Assert.Equal(20.0, ExpressionRun.Evaluate("if(x > 1, 10, 20)", ("x", x))[0]); // a NaN comparison is false, so "else"
        var low = ExpressionRun.Evaluate("min(x, 1)", ("x", x));
        var high = ExpressionRun.Evaluate("max(1, x, 0)", ("x", x));
        Assert.True(double.IsNaN(low[0]));                                         // NaN propagates (IEEE 754-2019 minimum)
        Assert.True(double.IsNaN(high[0]));                                       // NaN propagates (IEEE 754-2019 maximum)
        Assert.Equal(0.5, low[1]);
        Assert.Equal(1.0, high[1]);
        Assert.True(double.IsNaN(ExpressionRun.Scalar("sqrt(-1)")));               // IEEE 754 invalid operation
        Assert.True(double.IsNaN(ExpressionRun.Scalar("asin(2)")));
        Assert.Equal(double.NegativeInfinity, ExpressionRun.Scalar("log(0)"));     // IEEE 754 pole
    }

    [Fact]
    public void Conditionals_select_per_row_and_min_max_fold_many_columns()
    {
        double[] a = [1, 5, -2, 0];
        double[] b = [3, 4, -7, 0];
        double[] c = [2, 9, -3, -1];
        // [exact, hand-computed] row by row.
        Assert.Equal([3.0, 5.0, -2.0, 0.0], ExpressionRun.Evaluate("if(a > b, a, b)", ("a", a), ("b", b)));
        Assert.Equal([1.0, 4.0, -7.0, -1.0], ExpressionRun.Evaluate("min(a, b, c)", ("a", a), ("b", b), ("c", c)));
        Assert.Equal([3.0, 9.0, -2.0, 0.0], ExpressionRun.Evaluate("max(a, b, c)", ("a", a), ("b", b), ("c", c)));
        Assert.Equal([0.0, 1.0, 0.0, 0.0], ExpressionRun.Evaluate("a > 0 && b > 0 && c > 3", ("a", a), ("b", b), ("c", c)));
    }

    [Fact]
    public void Selections_are_boolean_and_numeric_expressions_are_not()
    {
        string[] columns = ["pt", "eta"];
        Assert.True(ExpressionCompiler.Compile("pt > 20 && abs(eta) < 2.4", columns, ExpressionRun.Start).IsBoolean);
        Assert.True(ExpressionCompiler.Compile("!(pt > 20)", columns, ExpressionRun.Start).IsBoolean);
        Assert.True(ExpressionCompiler.Compile("isnan(eta)", columns, ExpressionRun.Start).IsBoolean);
        Assert.True(ExpressionCompiler.Compile("1 < 2", columns, ExpressionRun.Start).IsBoolean); // kept through constant folding
        Assert.False(ExpressionCompiler.Compile("pt * 2", columns, ExpressionRun.Start).IsBoolean);
        Assert.False(ExpressionCompiler.Compile("if(pt > 1, 1, 0)", columns, ExpressionRun.Start).IsBoolean);
        Assert.False(ExpressionCompiler.Compile("-(pt > 1)", columns, ExpressionRun.Start).IsBoolean);
    }

    [Fact]
    public void Braced_names_reach_columns_with_any_characters_and_columns_are_listed_once()
    {
        double[] jet = [10, 20];
        double[] odd = [1, 2];
        // [exact, hand-computed]
        Assert.Equal([11.0, 22.0], ExpressionRun.Evaluate("{jet.pt} + {weird name-1}", ("jet.pt", jet), ("weird name-1", odd)));
        double[] pi = [5, 6];
        Assert.Equal([5.0 - Math.PI, 6.0 - Math.PI], ExpressionRun.Evaluate("{pi} - pi", ("pi", pi))); // bare pi is the constant
        var compiled = ExpressionCompiler.Compile("b*b + a - {b} + a", ["a", "b"], ExpressionRun.Start);
        Assert.Equal(["b", "a"], compiled.Columns);
    }

    [Fact]
    public void Constant_folding_leaves_a_single_step_and_keeps_the_value()
    {
        var compiled = ExpressionCompiler.Compile("2^10 * (1 + 1) - sqrt(16)", [], ExpressionRun.Start);
        Assert.Empty(compiled.Columns);
        var output = new double[3];
        compiled.Evaluate([], 3, output);
        Assert.Equal([2044.0, 2044.0, 2044.0], output); // [exact, hand-computed] 1024·2 − 4
    }

    [Fact]
    public void Batches_of_different_sizes_reuse_and_grow_the_buffers()
    {
        var compiled = ExpressionCompiler.Compile("x*x - y", ["x", "y"], ExpressionRun.Start);
        double[] x = [1, 2, 3, 4, 5];
        double[] y = [1, 1, 1, 1, 1];
        var output = new double[5];
        compiled.Evaluate([x, y], 2, output);
        Assert.Equal([0.0, 3.0, 0.0, 0.0, 0.0], output); // only `rows` results are written
        compiled.Evaluate([x, y], 5, output);
        Assert.Equal([0.0, 3.0, 8.0, 15.0, 24.0], output);
        compiled.Evaluate([x, y], 0, output);
        Assert.Throws<ArgumentException>(() => compiled.Evaluate([x], 5, output));
        Assert.Throws<ArgumentException>(() => compiled.Evaluate([x, y], 6, new double[6]));
        Assert.Throws<ArgumentException>(() => compiled.Evaluate([x, y], 5, new double[4]));
    }
}
