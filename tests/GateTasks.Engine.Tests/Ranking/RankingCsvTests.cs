using System.Globalization;
using CsvHelper;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.Ranking;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Ranking;

public class RankingCsvTests
{
    [Theory]
    // RFC 4180 §2, rules 5–7: a field holding a comma, a double quote or a line break is enclosed in double quotes,
    // and a double quote inside is escaped by another ("b""bb" is the RFC's own example).
    [InlineData("aaa", "aaa")]
    [InlineData("b\"bb", "\"b\"\"bb\"")]
    [InlineData("a,b", "\"a,b\"")]
    [InlineData("line\r\nbreak", "\"line\r\nbreak\"")]
    [InlineData("", "")]
    public void Fields_are_quoted_as_RFC_4180_says(string value, string expected) => Assert.Equal(expected, RankingCsv.Field(value));

    [Fact]
    public void The_table_reads_back_with_an_independent_csv_reader()
    {
        var at = new SourceLocation("c.yaml", 1, 1);
        var contract = new PrecisionContract("c.yaml", 1, "t", new SampleSpec("s.parquet", at, null, null), "r.parquet", at, DecisionSettings.Default, []);
        var odd = "dir, with \"quotes\"/epoch-1.parquet";
        var results = new[]
        {
            new CandidateResult(odd, [odd], 1234, [new CandidateCheck("m_gg", "ratio-max[core]", Verdict.Pass, new Margin(0.125, 0.03))], RunOutcome.Passed),
            new CandidateResult("impossible", ["impossible"], 10, [new CandidateCheck("m_gg", "ks-max", Verdict.Fail, new Margin(double.NegativeInfinity, double.NaN))], RunOutcome.Failed),
            CandidateResult.Unchecked("broken", new GateInputException(ErrorCodes.SampleUnreadable, "line one,\nline \"two\"")),
        };
        var report = new RankingReport(contract, "r.parquet", CandidateRanking.Rank(results));
        var text = RankingCsv.Format(report);
        Assert.EndsWith("\r\n", text);

        // CsvHelper (an independent RFC 4180 reader, the package the sample reader uses for input).
        var options = new CsvReaderOptions { Separator = ',', HasHeader = true, Mode = CsvMode.Rfc4180, DetectSeparatorHint = false };
        using var csv = CsvReader.FromText(text, options);
        var rows = new List<Dictionary<string, string>>();
        while (csv.Read())
            rows.Add(RankingCsv.Header.ToDictionary(h => h, h => csv.GetString(h)));
        Assert.Equal(RankingCsv.Header, csv.Headers);
        Assert.Equal(3, rows.Count);
        Assert.Equal(odd, rows[0]["candidate"]);
        Assert.Equal("0.125", rows[0]["worst_margin"]);
        Assert.Equal("0.03", rows[0]["worst_margin_noise"]);
        Assert.Equal("-Infinity", rows[1]["worst_margin"]);
        Assert.Equal(double.NegativeInfinity, double.Parse((string)rows[1]["worst_margin"], CultureInfo.InvariantCulture));
        Assert.Equal("", rows[2]["rank"]);
        Assert.Equal("GATE2002", rows[2]["error_code"]);
        Assert.Equal("not checked: GATE2002 line one,\nline \"two\"", rows[2]["reason"]);
    }
}
