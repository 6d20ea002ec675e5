using System.Text.Json;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Tests.Diagnostics;

/// <summary>
/// The record stream the build step reads: the reader (compiled into the build step's task too) gives back what the
/// writer wrote, every line is JSON that an independent parser (System.Text.Json, of the .NET 10 runtime) reads to
/// the same values, and the human line formatted from a parsed record is the console's line. Tests that compare the
/// program with itself, except where System.Text.Json is the oracle.
/// </summary>
public class RunRecordTests
{
    private static readonly Diagnostic[] Samples =
    [
        Diagnostic.Error("GATE3004", "feature 'm_gg' ks-max: 0.031 > 0.01", new SourceLocation("/repo/precision-contract.yaml", 12, 13)),
        new("GATE3100", DiagnosticSeverity.Warning, new SourceLocation("/repo/c.yaml", 8, 0), "feature 'x' ratio-max[core] is inconclusive; ≈833000 surrogate events needed to decide"),
        Diagnostic.Error("GATE2204", "sample files 'a.parquet' and 'b.parquet' have the same content", new SourceLocation("/data/b.parquet")),
        Diagnostic.Error("GATE0001", "Unrecognized command or argument '--frobnicate'."),
        // Everything a message can quote from a hostile input: quotes, backslashes, control characters, separators.
        Diagnostic.Error("GATE2006", "cell \"1,5\\n\" \t\u0001\u001f\u2028\u2029 é 𝛼 not a number", new SourceLocation("C:\\data\\x \"y\".csv", 3, 7)),
    ];

    public static TheoryData<int> Indexes() => new(Enumerable.Range(0, Samples.Length));

    [Theory]
    [MemberData(nameof(Indexes))]
    public void The_reader_gives_back_every_field_the_writer_wrote_and_the_console_line_follows(int index)
    {
        var d = Samples[index];
        var json = d.ToRecord().ToJson();
        Assert.DoesNotContain('\n', json);
        var back = RunRecord.Parse(json);
        Assert.NotNull(back);
        Assert.Equal(RunRecord.Version, back.V);
        Assert.Equal(RunRecord.DiagnosticType, back.Type);
        Assert.Equal(d.Code, back.Code);
        Assert.Equal(d.Severity.Token(), back.Severity);
        Assert.Equal(d.Kind, DiagnosticKindTokens.FromToken(back.Kind));
        Assert.Equal(d.Location?.File, back.File);
        Assert.Equal(d.Location?.Line ?? 0, back.Line);
        Assert.Equal(d.Location?.Column ?? 0, back.Column);
        Assert.Equal(d.Text, back.Text);
        // What the build step would show is what the console prints.
        Assert.Equal(d.Line, DiagnosticLine.Format(back.File, back.Line, back.Column, back.Severity!, back.Code!, back.Text!));
    }

    [Theory]
    [MemberData(nameof(Indexes))]
    public void Every_line_is_JSON_that_System_Text_Json_reads_to_the_same_values(int index)
    {
        var d = Samples[index];
        using var doc = JsonDocument.Parse(d.ToRecord().ToJson());
        var root = doc.RootElement;
        Assert.Equal(1, root.GetProperty("v").GetInt32());
        Assert.Equal("diagnostic", root.GetProperty("type").GetString());
        Assert.Equal(d.Code, root.GetProperty("code").GetString());
        Assert.Equal(d.Text, root.GetProperty("text").GetString());
        Assert.Equal(d.Location?.File, root.TryGetProperty("file", out var f) ? f.GetString() : null);
        Assert.Equal(d.Location?.Line ?? 0, root.GetProperty("line").GetInt32());
    }

    [Fact]
    public void The_reader_takes_what_System_Text_Json_writes_for_the_same_record()
    {
        // Another writer's escapes (\u0022, \/, upper-case hex) read the same.
        var text = "a \"b\" / c\\d \u0007 é";
        var json = JsonSerializer.Serialize(new Dictionary<string, object> { ["v"] = 1, ["type"] = "text", ["level"] = "summary", ["text"] = text });
        var record = RunRecord.Parse(json);
        Assert.NotNull(record);
        Assert.Equal(text, record.Text);
        Assert.Equal(RunRecord.SummaryLevel, record.Level);
        Assert.Equal(text, RunRecord.Parse("{\"v\":1,\"type\":\"text\",\"text\":\"a \\u0022b\\u0022 \\/ c\\\\d \\u0007 \\u00E9\"}")!.Text);
    }

    [Theory]
    [InlineData("")] // an empty line
    [InlineData("{\"v\":1,\"type\":\"diagnostic\",\"code\":\"GATE3")] // the torn last line of a killed run
    [InlineData("{\"type\":\"outcome\",\"outcome\":\"passed\"}")] // no version
    [InlineData("{\"v\":1}")] // no type
    [InlineData("{\"v\":1.5,\"type\":\"outcome\"}")] // not an integer
    [InlineData("{\"v\":1,\"type\":\"outcome\",\"outcome\":{\"x\":1}}")] // nested
    [InlineData("{\"v\":1,\"type\":\"outcome\",\"outcome\":\"passed\",\"outcome\":\"failed\"}")] // a key twice
    [InlineData("{\"v\":1,\"type\":\"outcome\"} trailing")]
    [InlineData("error GATE3004: feature 'm_gg' ks-max")] // the console's text is not a record
    public void The_reader_refuses_anything_but_a_whole_flat_record(string line) => Assert.Null(RunRecord.Parse(line));

    [Fact]
    public void Kinds_come_from_codes_in_one_place()
    {
        // docs/error-codes.md: GATE0xxx set-up, 1xxx contract, 2xxx sample and reference, 3xxx drift (3100 inconclusive), 4xxx ledger (4010 ratchet).
        Assert.Equal(DiagnosticKind.Setup, Diagnostic.KindOf("GATE0012"));
        Assert.Equal(DiagnosticKind.Contract, Diagnostic.KindOf("GATE1004"));
        Assert.Equal(DiagnosticKind.Sample, Diagnostic.KindOf("GATE2101"));
        Assert.Equal(DiagnosticKind.Drift, Diagnostic.KindOf("GATE3004"));
        Assert.Equal(DiagnosticKind.Inconclusive, Diagnostic.KindOf("GATE3100"));
        Assert.Equal(DiagnosticKind.Ratchet, Diagnostic.KindOf("GATE4010"));
        Assert.Equal(DiagnosticKind.Acceptance, Diagnostic.KindOf("GATE4003"));
        Assert.True(DiagnosticKind.Ratchet.IsFidelity());
        Assert.False(DiagnosticKind.Acceptance.IsFidelity());
        foreach (var kind in Enum.GetValues<DiagnosticKind>()) Assert.Equal(kind, DiagnosticKindTokens.FromToken(kind.Token()));
    }
}
