using System.Text.RegularExpressions;
using GateTasks.Engine.Checks;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Reports;
using GateTasks.Engine.Runs;

namespace GateTasks.Engine.Tests.Reports;

/// <summary>
/// The Markdown summary's table syntax, checked against the GitHub Flavored Markdown spec 0.29-gfm, section 4.10
/// (tables): a header row, a delimiter row of the same number of cells made of dashes with optional colons, body
/// rows; a literal pipe inside a cell is escaped as \|.
/// </summary>
public sealed class MarkdownSummaryTests(ReportCase run) : IClassFixture<ReportCase>
{
    private static readonly Regex Delimiter = new(@"^\|( *:?-+:? *\|)+$");

    /// <summary>The cells of a table row, splitting at unescaped pipes.</summary>
    private static List<string> Cells(string row) =>
        Regex.Split(row.Trim().Trim('|'), @"(?<!\\)\|").Select(c => c.Trim()).ToList();

    /// <summary>Each run of lines starting with '|' is a table.</summary>
    private static List<List<string>> Tables(string markdown)
    {
        var tables = new List<List<string>>();
        List<string>? current = null;
        foreach (var line in markdown.Split('\n'))
        {
            if (line.StartsWith('|')) (current ??= []).Add(line);
            else if (current is not null) { tables.Add(current); current = null; }
        }
        if (current is not null) tables.Add(current);
        return tables;
    }

    [Fact]
    public void A_failing_run_lists_its_failing_checks_in_a_well_formed_table_and_folds_the_passing_ones()
    {
        var report = run.Run(30_000, 3, 0.3);
        var md = MarkdownSummary.Render(report);
        Assert.StartsWith("### GateTasks check FAILED: report-case\n", md);
        Assert.Contains($"**{report.Failures} failed**", md);
        var tables = Tables(md);
        Assert.Equal(2, tables.Count);
        foreach (var table in tables)
        {
            var width = Cells(table[0]).Count;
            Assert.Matches(Delimiter, table[1]);
            Assert.Equal(width, Cells(table[1]).Count);
            Assert.All(table.Skip(2), row => Assert.Equal(width, Cells(row).Count));
        }
        // "used": the check's share of its tolerance (docs/reports.md).
        Assert.Equal(["feature", "check", "region", "estimate", "tolerance", "used", "verdict"], Cells(tables[0][0]));
        var failing = tables[0].Skip(2).Select(Cells).ToList();
        Assert.Equal(report.Outcomes.Count(o => o.Verdict != Verdict.Pass), failing.Count);
        var ks = report.Outcomes.Single(o => o.Subject.Name == "x" && o.Check.Kind == CheckKind.KolmogorovSmirnov);
        Assert.Equal(Verdict.Fail, ks.Verdict);
        Assert.Contains(failing, r => r[0] == "`x`" && r[1] == "ks-max" && r[2] == "all" && r[4] == "≤ 0.03" && r[5] == HeadroomText.Cell(Headroom.Of(ks, report.Contract.Decision)) && r[6] == "**FAIL**");
        // The passing checks sit in a details block, after its summary line and a blank line.
        var passing = report.Outcomes.Count(o => o.Verdict == Verdict.Pass);
        Assert.Contains($"<details><summary>{passing} passing checks</summary>\n\n|", md);
        Assert.Equal(passing, tables[1].Count - 2);
        Assert.True(md.IndexOf("<details>", StringComparison.Ordinal) < md.LastIndexOf(tables[1][0], StringComparison.Ordinal));
    }

    [Fact]
    public void A_passing_run_has_no_failure_table()
    {
        var report = run.Run(30_000, 2, 0);
        Assert.True(report.Outcomes.All(o => o.Verdict == Verdict.Pass), string.Join("\n", report.Outcomes.Select(o => $"{o.Subject.Name} {o.Check.Label}: {o.Verdict} {o.Summary}")));
        var md = MarkdownSummary.Render(report);
        Assert.Equal("### GateTasks check PASSED: report-case", md.Split('\n')[0]);
        var table = Assert.Single(Tables(md));
        Assert.Equal(["feature", "check", "region", "estimate", "tolerance", "used"], Cells(table[0]));
        Assert.Equal(report.Outcomes.Count, table.Count - 2);
    }

    [Fact]
    public void A_passing_run_whose_contract_is_not_the_accepted_one_says_so_first_in_both_reports()
    {
        var report = run.Run(30_000, 2, 0) with
        {
            Acceptance = [new GateTasks.Engine.Ledger.LedgerFinding(GateTasks.Engine.Diagnostics.ErrorCodes.LedgerUnrecordedLoosening, true,
                "x ks-max changed from 0.03 to 0.05 since entry 1", new GateTasks.Engine.Diagnostics.SourceLocation("c.yaml", 8, 13))],
        };
        Assert.True(report.NoCheckFailed());
        var md = MarkdownSummary.Render(report).Split('\n');
        Assert.Equal("### GateTasks check NOT ACCEPTED: report-case", md[0]);
        Assert.Equal("- **GATE4003** x ks-max changed from 0.03 to 0.05 since entry 1", md[2]);
        var html = HtmlReport.Render(report);
        Assert.Contains("id=\"overall\">NOT ACCEPTED</span>", html);
        Assert.Contains("error GATE4003</span> x ks-max changed from 0.03 to 0.05 since entry 1", html);
        // No word of the run's own reports may call it a pass: the HTML title and page attribute, and the summary line the
        // console and the text report print (the verdict words are the documented ones, docs/reports.md).
        Assert.Contains("<title>NOT ACCEPTED ", html);
        Assert.Contains("<body data-verdict=\"not-accepted\">", html);
        Assert.DoesNotContain("PASSED", html);
        Assert.StartsWith("NOT ACCEPTED: ", ResultTable.Summary(report));
        Assert.DoesNotContain("PASSED", string.Join("\n", md));
    }
}
