using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Expressions;

namespace GateTasks.Engine.Tests.Expressions;

/// <summary>Compiles and evaluates expressions for tests, and captures the errors they raise.</summary>
internal static class ExpressionRun
{
    /// <summary>Where every test expression "starts" in its contract: line 12, column 20.</summary>
    public static readonly SourceLocation Start = new("contract.yaml", 12, 20);

    /// <summary>Evaluates <paramref name="text"/> over the given columns (all the same length).</summary>
    public static double[] Evaluate(string text, params (string Name, double[] Values)[] columns)
    {
        var compiled = ExpressionCompiler.Compile(text, columns.Select(c => c.Name).ToArray(), Start);
        var byName = columns.ToDictionary(c => c.Name, c => c.Values);
        var rows = columns.Length == 0 ? 1 : columns[0].Values.Length;
        var output = new double[rows];
        compiled.Evaluate(compiled.Columns.Select(n => byName[n]).ToArray(), rows, output);
        return output;
    }

    /// <summary>The value of an expression without columns.</summary>
    public static double Scalar(string text) => Evaluate(text)[0];

    /// <summary>The error compiling <paramref name="text"/> raises, asserted to carry GATE1009 on line 12 of contract.yaml.</summary>
    public static GateInputException Error(string text, params string[] available)
    {
        var e = Assert.Throws<GateInputException>(() => ExpressionCompiler.Compile(text, available, Start));
        Assert.Equal(ErrorCodes.ContractExpression, e.Code);
        Assert.Equal("GATE1009", e.Code);
        Assert.NotNull(e.Location);
        Assert.Equal("contract.yaml", e.Location.File);
        Assert.Equal(12, e.Location.Line);
        return e;
    }

    /// <summary>Asserts the error's caret is on the character at <paramref name="offset"/> of the text.</summary>
    public static void AssertAt(GateInputException e, int offset) => Assert.Equal(Start.Column + offset, e.Location!.Column);
}
