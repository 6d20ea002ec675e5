using System.Text;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Expressions;

namespace GateTasks.Engine.Tests.Expressions;

/// <summary>
/// Input meant to break out of the sandbox or the parser: each is refused with GATE1009 at a stated place,
/// or has a defined numeric result. Offsets are counted by hand.
/// </summary>
public class ExpressionHostileInputTests
{
    private static readonly string[] Columns = ["a", "b", "pt", "eta", "jet.pt"];

    [Fact]
    public void Over_long_input_is_refused_and_the_longest_allowed_still_evaluates()
    {
        ExpressionRun.AssertAt(ExpressionRun.Error(new string(' ', 10_000) + "a", Columns), 0); // 10 001 characters

        // 10 000 characters: "a+a+…+a " — a flat chain, nothing recurses over it.
        var longest = string.Join("+", Enumerable.Repeat("a", 5000)) + " ";
        Assert.Equal(ExpressionCompiler.MaxLength, longest.Length);
        var compiled = ExpressionCompiler.Compile(longest, Columns, ExpressionRun.Start);
        var output = new double[2];
        compiled.Evaluate([new double[] { 1, 2 }], 2, output);
        Assert.Equal([5000.0, 10000.0], output); // [exact, hand-computed] 5000·a
    }

    [Fact]
    public void Deep_nesting_is_refused_past_the_limit_and_accepted_at_it()
    {
        ExpressionRun.AssertAt(ExpressionRun.Error(new string('(', 65) + "1" + new string(')', 65), Columns), 64);
        Assert.Equal(1.0, ExpressionRun.Scalar(new string('(', 64) + "1" + new string(')', 64)));
        // Thousands of prefix operators or exponents must not exhaust the stack.
        ExpressionRun.AssertAt(ExpressionRun.Error(new string('-', 5000) + "1", Columns), 64);
        ExpressionRun.AssertAt(ExpressionRun.Error(string.Concat(Enumerable.Repeat("! ", 2000)) + "1", Columns), 64 * 2);
        ExpressionRun.AssertAt(ExpressionRun.Error(string.Concat(Enumerable.Repeat("2^", 2000)) + "1", Columns), 64 * 2 + 1);
        ExpressionRun.Error(new string('(', 5000) + new string(')', 4999), Columns);
    }

    [Theory]
    [InlineData("a.b", 1)]                 // member access
    [InlineData("System.IO.File", 6)]      // a type path: the first '.'
    [InlineData("pt.ToString()", 2)]
    [InlineData("\"string\"", 0)]          // strings
    [InlineData("'string'", 0)]
    [InlineData("a = 1", 2)]               // assignment
    [InlineData("a += 1", 3)]              // '+' then an '=' that is not '=='
    [InlineData("exec(1)", 0)]             // not a listed function
    [InlineData("typeof(a)", 0)]
    [InlineData("a; b", 1)]
    [InlineData("a[0]", 1)]
    [InlineData("{a", 0)]                  // a brace never closed
    [InlineData("a}", 1)]                  // a closing brace nothing opened
    [InlineData("a ? 1 : 2", 2)]
    [InlineData("@a", 0)]
    [InlineData("$a", 0)]
    [InlineData("a\\b", 1)]
    [InlineData("a ** 2", 2)]
    [InlineData("a & b", 2)]
    [InlineData("a | b", 2)]
    [InlineData("a, b", 1)]
    [InlineData("a\nb", 1)]                // an interior line break
    [InlineData("a\0", 1)]
    [InlineData("{}", 0)]                  // an empty braced name
    [InlineData("{a\nb}", 0)]              // a braced name across a line break
    [InlineData("pt(1)", 0)]               // a valid column used as a function
    [InlineData("{pt}(1)", 0)]
    [InlineData("pi(1)", 0)]
    [InlineData("sqrt", 0)]                // a function used as a value
    [InlineData("sqrt + 1", 0)]
    [InlineData("&&", 0)]
    [InlineData("a &&", 4)]
    [InlineData("!", 1)]
    [InlineData("()", 1)]
    [InlineData(")", 0)]
    [InlineData("max(a,)", 6)]
    [InlineData("1.2.3", 0)]
    [InlineData("1e", 0)]
    [InlineData("1e400", 0)]               // overflows a double: refused rather than read as infinity
    [InlineData("-1e400", 1)]
    [InlineData("a.5", 1)]                 // a column followed by the number .5
    public void Sandbox_escapes_and_malformed_input_are_refused(string text, int offset)
    {
        ExpressionRun.AssertAt(ExpressionRun.Error(text, Columns), offset);
    }

    [Theory]
    [InlineData("pt \u2212 1", 3, "'-'")]          // MINUS SIGN
    [InlineData("pt \u2013 1", 3, "'-'")]          // EN DASH
    [InlineData("pt \u00D7 2", 3, "'*'")]          // MULTIPLICATION SIGN
    [InlineData("pt \u2264 2", 3, "'<='")]         // LESS-THAN OR EQUAL TO
    [InlineData("\u03C0 * 2", 0, "'pi'")]          // GREEK SMALL LETTER PI
    [InlineData("et\u0430", 2, "")]                // CYRILLIC SMALL LETTER A in "eta"
    [InlineData("\uFF11 + 1", 0, "")]              // FULLWIDTH DIGIT ONE
    [InlineData("pt\u00A0+ 1", 2, "a plain space")] // NO-BREAK SPACE
    [InlineData("pt\u200B+ 1", 2, "")]             // ZERO WIDTH SPACE
    [InlineData("\u202Ept", 0, "")]                // RIGHT-TO-LEFT OVERRIDE
    [InlineData("pt + \U0001F600", 5, "")]         // an emoji (a surrogate pair)
    [InlineData("pt + \uD800", 5, "")]             // a lone surrogate
    [InlineData("\u201Cpt\u201D", 0, "{name} (braces)")] // typographic quotes
    public void Unicode_lookalikes_are_refused_where_they_are(string text, int offset, string hint)
    {
        var e = ExpressionRun.Error(text, Columns);
        ExpressionRun.AssertAt(e, offset);
        Assert.Contains("only ASCII", e.Message);
        Assert.Contains(hint, e.Message);
        // Invisible and direction-changing characters are named by code only, never copied into the message.
        Assert.DoesNotContain('\u202E', e.Message);
        Assert.DoesNotContain('\u200B', e.Message);
    }

    [Fact]
    public void Numeric_edge_cases_have_defined_results()
    {
        // IEEE 754 overflow and underflow in computation give ±inf and 0 (only an overflowing literal is refused).
        Assert.Equal(double.PositiveInfinity, ExpressionRun.Scalar("exp(1000)"));
        Assert.Equal(double.PositiveInfinity, ExpressionRun.Scalar("10^400"));
        Assert.Equal(double.PositiveInfinity, ExpressionRun.Scalar("1e308 * 10"));
        Assert.Equal(0.0, ExpressionRun.Scalar("1e-400"));               // a literal below the smallest subnormal reads as 0
        Assert.Equal(0.0, ExpressionRun.Scalar("exp(-1000)"));
        Assert.Equal(double.MaxValue, ExpressionRun.Scalar("1.7976931348623157e308"));
        Assert.True(double.IsNaN(ExpressionRun.Scalar("1e308*10 - 1e308*10"))); // inf − inf
        Assert.Equal(1.0, ExpressionRun.Scalar("pow(0/0, 0)"));           // IEEE 754 pow(x, 0) = 1 even for NaN (Math.Pow)
        Assert.Equal(1.0, ExpressionRun.Scalar("2^-1074 > 0"));           // the smallest subnormal
        Assert.True(double.IsNaN(ExpressionRun.Scalar("5 % 0")));         // IEEE 754 remainder by zero
    }

    [Fact]
    public void Random_input_never_escapes_as_anything_but_a_coded_expression_error()
    {
        // Deterministic fuzz over the language's own characters and some that are not in it.
        const string alphabet = "ab ptq()+-*/%^<>=!&|,.`0123456789e_\"'[]{};:?#\t\u2212\u0430";
        string[] words = ["sqrt(", "min(", "if(", "&& ", "|| ", "!", "and ", "not ", "pi", "atan2(", "{jet.pt}", "{a}", "`a`", "1e3", ".5", "==", "<="];
        var random = new Random(20260);
        var compiled = 0;
        for (var trial = 0; trial < 20_000; trial++)
        {
            var text = new StringBuilder();
            var length = random.Next(1, 30);
            for (var k = 0; k < length; k++)
            {
                if (random.Next(3) == 0) text.Append(words[random.Next(words.Length)]);
                else text.Append(alphabet[random.Next(alphabet.Length)]);
            }
            try
            {
                var expression = ExpressionCompiler.Compile(text.ToString(), Columns, ExpressionRun.Start);
                var columns = expression.Columns.Select(_ => new double[] { 1.5, double.NaN, -2 }).ToArray();
                expression.Evaluate(columns, 3, new double[3]);
                compiled++;
            }
            catch (GateInputException e)
            {
                // docs/error-codes.md: GATE1009, or GATE1017/GATE1018 for the refused logic words and backquotes.
                Assert.Contains(e.Code, new[] { ErrorCodes.ContractExpression, ErrorCodes.ExpressionLogicWord, ErrorCodes.ExpressionBackquotedName });
                Assert.InRange(e.Location!.Column, 20, 20 + text.Length);
            }
        }
        Assert.InRange(compiled, 1, 19_999); // both outcomes occurred
    }

    [Fact]
    public void The_expression_engine_names_no_reflection_files_network_processes_or_code_generation()
    {
        // The sandbox holds because the expression code cannot reach anything but columns and Math: a guard against a
        // later change that would let it (the compiler emits its own instructions, never IL or expression trees).
        var folder = new DirectoryInfo(AppContext.BaseDirectory);
        while (!File.Exists(Path.Combine(folder!.FullName, "GateTasks.sln"))) folder = folder.Parent;
        string[] forbidden =
        [
            "System.Reflection", "System.IO", "System.Net", "System.Diagnostics", "System.Linq.Expressions",
            "System.Runtime.Loader", "System.Runtime.InteropServices", "Activator", "GetType", "typeof", "DynamicMethod",
            "Environment", "File", "Directory", "Process", "Assembly", "unsafe", "Thread", "Task",
        ];
        var sources = Directory.GetFiles(Path.Combine(folder.FullName, "src", "GateTasks.Engine", "Expressions"), "*.cs");
        Assert.NotEmpty(sources);
        foreach (var source in sources)
        {
            // Comments may mention anything; code may not.
            var code = string.Join('\n', File.ReadLines(source).Select(l => l.Split("//")[0]));
            foreach (var name in forbidden)
                Assert.False(System.Text.RegularExpressions.Regex.IsMatch(code, $@"\b{System.Text.RegularExpressions.Regex.Escape(name)}\b"),
                    $"{Path.GetFileName(source)} names {name}");
        }
    }
}
