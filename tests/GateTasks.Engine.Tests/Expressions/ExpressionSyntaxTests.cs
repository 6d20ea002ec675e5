using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Expressions;

namespace GateTasks.Engine.Tests.Expressions;

/// <summary>
/// The expression language's own spelling (docs/contract.md, "Derived features and the selection"): column names that
/// are not identifiers in braces, logic with <c>&amp;&amp;</c>, <c>||</c>, <c>!</c>; the word operators and backquoted
/// names refused with what to write instead (docs/error-codes.md, GATE1017 and GATE1018), the caret on the word or the
/// backquote (start column 20 plus the 0-based offset, counted by hand). Values are exact and hand-computed.
/// </summary>
public class ExpressionSyntaxTests
{
    private static readonly string[] Columns = ["pt", "eta", "jet pt", "jet.eta", "n-jets", "and"];

    private static GateInputException Refused(string text, string code)
    {
        var e = Assert.Throws<GateInputException>(() => ExpressionCompiler.Compile(text, Columns, ExpressionRun.Start));
        Assert.Equal(code, e.Code);
        Assert.Equal("contract.yaml", e.Location!.File);
        Assert.Equal(12, e.Location.Line);
        return e;
    }

    [Fact]
    public void Braces_reach_columns_whose_names_are_not_identifiers()
    {
        double[] jetPt = [30, 50];
        double[] jetEta = [0.5, -3];
        double[] nJets = [1, 4];
        // [exact, hand-computed] 30·2 + 1 = 61 and 50·2 + 4 = 104
        Assert.Equal([61.0, 104.0], ExpressionRun.Evaluate("{jet pt} * 2 + {n-jets}", ("jet pt", jetPt), ("n-jets", nJets)));
        // A braced name may hold a '.', a space or an operator character; spaces inside the braces are the name's own.
        Assert.Equal([1.0, 0.0], ExpressionRun.Evaluate("abs({jet.eta}) < 2.4", ("jet.eta", jetEta)));
        // A word the language refuses as an operator is still a column in braces.
        Assert.Equal([2.0, 0.0], ExpressionRun.Evaluate("{and} * 2", ("and", new double[] { 1, 0 })));
    }

    [Theory]
    [InlineData("1 && 0", 0.0)]
    [InlineData("1 || 0", 1.0)]
    [InlineData("!0", 1.0)]
    [InlineData("!(1 < 2) || 3 > 2 && 0", 0.0)] // (!(1 < 2)) || ((3 > 2) && 0): && binds tighter than ||
    [InlineData("!!5", 1.0)]
    public void Logic_is_written_with_symbols(string text, double expected) =>
        Assert.Equal(expected, ExpressionRun.Scalar(text)); // [exact, hand-computed]

    [Theory]
    [InlineData("pt > 20 and eta < 2", 8, "and", "&&")]
    [InlineData("pt > 20 or eta < 2", 8, "or", "||")]
    [InlineData("not (pt > 20)", 0, "not", "!")]
    [InlineData("pt > 1 && not(eta < 2)", 10, "not", "!")]
    [InlineData("and", 0, "and", "&&")]
    public void Logic_words_are_refused_at_the_word_with_the_operator_to_write(string text, int offset, string word, string written)
    {
        var e = Refused(text, ErrorCodes.ExpressionLogicWord);
        ExpressionRun.AssertAt(e, offset);
        Assert.Equal("GATE1017", e.Code);
        Assert.Equal($"'{word}' is not an operator; write '{written}' (a column named '{word}' is written {{{word}}})", e.Message);
    }

    [Theory]
    [InlineData("`jet pt` > 20", 0, "write {jet pt}")]
    [InlineData("pt + `jet.eta`", 5, "write {jet.eta}")]
    [InlineData("pt + `jet", 5, "write {jet pt}")]      // never closed: the message shows the form with an example name
    [InlineData("``", 0, "write {jet pt}")]
    public void Backquoted_names_are_refused_at_the_backquote_with_the_braced_spelling(string text, int offset, string says)
    {
        var e = Refused(text, ErrorCodes.ExpressionBackquotedName);
        ExpressionRun.AssertAt(e, offset);
        Assert.Equal("GATE1018", e.Code);
        Assert.StartsWith("backquotes do not quote column names", e.Message);
        Assert.EndsWith(says, e.Message);
    }

    [Theory]
    [InlineData("{jet pt", 0, "this '{' is never closed")]
    [InlineData("pt + {}", 5, "empty column name {}")]
    [InlineData("pt }", 3, "unexpected '}'")]
    [InlineData("{jet\npt}", 0, "never closed")]
    [InlineData("{mass} > 1", 0, "unknown column {mass}")]
    public void Malformed_braces_are_GATE1009_where_they_are(string text, int offset, string says)
    {
        var e = ExpressionRun.Error(text, Columns);
        ExpressionRun.AssertAt(e, offset);
        Assert.Contains(says, e.Message);
    }

    private static GateInputException ContractError(string selectionLine)
    {
        var yaml = $"""
            contract-version: 1
            sample: s.csv
            reference: ref.parquet
            {selectionLine}
            features:
              - name: pt
                checks:
                  ks-max: 0.05
            """;
        return Assert.Throws<GateInputException>(() => ContractLoader.Parse(yaml, "/tmp/precision-contract.yaml"));
    }

    [Theory]
    [InlineData("selection: {jet pt}", "mapping")]
    [InlineData("selection: !is_fake", "tag")]
    public void An_unquoted_expression_YAML_reads_as_something_else_is_GATE1019_at_its_value(string line, string says)
    {
        var e = ContractError(line);
        Assert.Equal(ErrorCodes.ExpressionNotQuotedInYaml, e.Code);
        Assert.Equal("GATE1019", e.Code);
        Assert.Equal(4, e.Location!.Line);
        Assert.Equal(12, e.Location.Column);
        Assert.Contains(says, e.Message);
        Assert.Contains("must be in quotes", e.Message);
    }

    [Fact]
    public void A_quoted_expression_that_starts_with_a_brace_or_a_bang_is_read_as_written()
    {
        var contract = ContractLoader.Parse("""
            contract-version: 1
            sample: s.csv
            reference: ref.parquet
            selection: "!({jet pt} < 20) && pt > 1"
            features:
              - name: pt
                checks: { ks-max: 0.05 }
            """, "/tmp/precision-contract.yaml");
        Assert.Equal("!({jet pt} < 20) && pt > 1", contract.Selection!.Text);
        // The caret of an expression error counts from the first character inside the quotes (column 13).
        var e = Assert.Throws<GateInputException>(() =>
            ExpressionCompiler.Compile(contract.Selection.Text, ["pt"], contract.Selection.Location));
        Assert.Equal(4, e.Location!.Line);
        Assert.Equal(13 + 2, e.Location.Column); // the '{' of {jet pt}: an unknown column here
    }
}
