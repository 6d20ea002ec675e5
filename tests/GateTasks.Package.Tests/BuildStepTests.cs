using System.Text.RegularExpressions;
using System.Xml.Linq;

namespace GateTasks.Package.Tests;

/// <summary>The gate as a build step, consumed exactly as a user does: template, package reference, dotnet build.</summary>
[Collection(PackageCollection.Name)]
public class BuildStepTests(PackageFeed feed)
{
    [Fact]
    public void Template_lays_out_the_gate_with_contract_readme_and_two_ci_definitions()
    {
        var p = GateProject.Create(feed, "LayoutGate");
        Assert.True(File.Exists(p.ProjectFile));
        var project = File.ReadAllText(p.ProjectFile);
        Assert.Contains($"""Include="GateTasks" Version="{PackageFeed.Version}" """.TrimEnd(), project);
        Assert.Contains("Microsoft.Build.NoTargets", project);
        Assert.True(File.Exists(Path.Combine(p.Directory, "README.md")));
        Assert.Contains("git ls-files ':(glob)**/LayoutGate.csproj'", File.ReadAllText(Path.Combine(p.Directory, ".github", "workflows", "precision-gate.yml")));
        Assert.Contains("junit: gate-reports/*.junit.xml", File.ReadAllText(Path.Combine(p.Directory, ".gitlab-ci.yml")));
    }

    [Fact]
    public void A_loosened_tolerance_fails_the_build_until_accepted_and_an_edited_ledger_entry_fails_it_again()
    {
        var p = GateProject.Create(feed, "LedgerGate");
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.DoesNotContain("GATE40", output);

        // Loosen m_gg's width tolerance without recording it: the build fails at that line, naming the command.
        var contract = Path.Combine(p.Directory, "precision-contract.yaml");
        File.WriteAllText(contract, File.ReadAllText(contract).Replace("      width-ratio-max: 0.01", "      width-ratio-max: 0.02"));
        (code, output) = p.Build();
        Assert.NotEqual(0, code);
        Assert.Matches(new Regex(@"precision-contract\.yaml\(48,24\): error GATE4003: m_gg width-ratio-max changed from 0\.01 to 0\.02 since entry 1 .*record it with: gatetasks accept --contract .*precision-contract\.yaml --reason"), output);
        // Warning mode turns drift into warnings, never an unrecorded loosening.
        (code, output) = p.Build("-p:GateFailuresAsWarnings=true");
        Assert.NotEqual(0, code);
        Assert.Contains("error GATE4003", output);

        // Accept it with the packaged engine, as the error says: the build passes again.
        var (accepted, acceptOutput) = feed.DotnetAllowingFailure(p.Directory, [feed.Engine, "accept", "--contract", contract, "--reason", "width checked against the fit's own systematic", "--by", "E2E Tester <e2e@example.org>"]);
        Assert.True(accepted == 0, acceptOutput);
        (code, output) = p.Build();
        Assert.True(code == 0, output);

        // Editing the first entry afterwards breaks the chain: the build fails and names the entry.
        var ledger = Path.Combine(p.Directory, "precision-contract.ledger");
        File.WriteAllText(ledger, File.ReadAllText(ledger).Replace("by \"GateTasks demo\"", "by \"Somebody Else\""));
        (code, output) = p.Build();
        Assert.NotEqual(0, code);
        Assert.Matches(new Regex(@"precision-contract\.ledger\(5,1\): error GATE4002: Entry 1 \(line 5\) was edited"), output);
    }

    [Fact]
    public void With_GateBaseRevision_a_ledger_entry_edited_and_resealed_fails_the_build()
    {
        var p = GateProject.Create(feed, "BaseRevisionGate");
        void Git(params string[] args)
        {
            var (exit, stdout, stderr) = GateTasks.Tests.Shared.ProcessRunner.Run("git", args, p.Directory);
            Assert.True(exit == 0, $"git {string.Join(' ', args)}: {stdout}{stderr}");
        }
        Git("init", "-q", "-b", "main");
        Git("config", "user.email", "e2e@example.org");
        Git("config", "user.name", "E2E Tester");
        Git("config", "commit.gpgsign", "false");
        Git("add", "-A");
        Git("commit", "-q", "-m", "the accepted state");
        Git("checkout", "-q", "-b", "feature");

        // Entry 1 edited and every seal recomputed: the chain is intact, so without a base revision the build passes
        // and says the history was not checked (docs/ledger.md, docs/msbuild.md).
        var ledger = Path.Combine(p.Directory, "precision-contract.ledger");
        GateTasks.Tests.Shared.LedgerReseal.Edit(ledger, "by \"GateTasks demo\"", "by \"Somebody Else\"");
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Contains("ledger history: not checked", output);

        // With the target branch as base revision, the build fails at the edited entry; and again on a rebuild with
        // nothing changed, since the base's ledger is no input file the up-to-date check could see.
        for (var run = 0; run < 2; run++)
        {
            (code, output) = p.Build("-p:GateBaseRevision=main");
            Assert.NotEqual(0, code);
            Assert.Matches(new Regex(@"precision-contract\.ledger\(5,1\): error GATE4002: Entry 1 \(line 5\) is not the entry accepted at base revision main"), output);
        }

        // An unknown base revision is an error, never a pass.
        (code, output) = p.Build("-p:GateBaseRevision=no-such-branch");
        Assert.NotEqual(0, code);
        Assert.Contains("error GATE4012", output);
    }

    [Fact]
    public void Faithful_sample_builds_writes_reports_and_an_unchanged_rebuild_skips_the_check()
    {
        var p = GateProject.Create(feed, "FaithfulGate");
        // A later target of the user's sees the reports as items, as a publishing step would.
        File.WriteAllText(p.ProjectFile, File.ReadAllText(p.ProjectFile).Replace("</Project>", """
              <Target Name="ShowGateReports" AfterTargets="GateCheck">
                <Message Importance="high" Text="gate-report %(GateReport.Kind): %(GateReport.Identity)" />
              </Target>
            </Project>
            """));
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Contains("PASSED: 77 of 77 checks", output);
        // The binding checks follow the verdict in the build's log (docs/msbuild.md).
        Assert.Contains("Binding checks (5 closest to their tolerance, of those not failed):", output);
        Assert.True(File.Exists(p.JUnitReport), output);
        Assert.Contains($"gate-report junit: {p.JUnitReport}", output);
        Assert.Contains("gate-report text: ", output);
        Assert.True(File.Exists(Path.Combine(p.ReportDirectory, "precision-contract.txt")));
        Assert.Contains($"gate-report html: {Path.Combine(p.ReportDirectory, "precision-contract.html")}", output);
        Assert.Contains($"gate-report markdown: {Path.Combine(p.ReportDirectory, "precision-contract.md")}", output);
        Assert.Contains("<svg", File.ReadAllText(Path.Combine(p.ReportDirectory, "precision-contract.html")));
        Assert.StartsWith("### GateTasks check PASSED", File.ReadAllText(Path.Combine(p.ReportDirectory, "precision-contract.md")));

        var (again, second) = p.Build();
        Assert.True(again == 0, second);
        Assert.Contains("GateTasks: up to date, the check is skipped", second);
        Assert.DoesNotContain("PASSED:", second);

        // A new modification time alone changes nothing: content decides (a changed content reruns, see StaleVerdictTests).
        File.SetLastWriteTimeUtc(Path.Combine(p.Directory, "surrogate-faithful.parquet"), DateTime.UtcNow.AddSeconds(5));
        var (third, rerun) = p.Build();
        Assert.True(third == 0, rerun);
        Assert.Contains("GateTasks: up to date, the check is skipped", rerun);

        // So does a changed setting.
        var (fourth, settings) = p.Build("-p:GateReportDir=other-reports/");
        Assert.True(fourth == 0, settings);
        Assert.True(File.Exists(Path.Combine(p.Directory, "other-reports", "precision-contract.junit.xml")));
    }

    [Fact]
    public void A_no_op_build_reuses_the_input_list_until_a_file_joins_the_sample_glob()
    {
        var p = GateProject.Create(feed, "ShardGlobGate");
        var shards = Path.Combine(p.Directory, "shards");
        Directory.CreateDirectory(shards);
        File.Copy(Path.Combine(p.Directory, "surrogate-faithful.parquet"), Path.Combine(shards, "part-1.parquet"));
        var glob = "-p:GateSample=shards/*.parquet";

        var (code, first) = p.Build(glob);
        Assert.True(code == 0, first);
        Assert.Contains("PASSED: 77 of 77 checks", first);

        // Nothing changed: the list of inputs comes from the cache, without starting the engine, and the check is skipped.
        var (again, second) = p.Build(glob, "-v:d");
        Assert.True(again == 0, second);
        Assert.Contains("are as last listed", second);
        Assert.Contains("GateTasks: up to date, the check is skipped", second);

        // A second shard (other events of the same distribution) matching the glob changes the folder: the engine lists
        // the inputs again and the check reruns on both.
        GateTasks.Engine.Demo.DemoSampleWriter.Write(Path.Combine(shards, "part-2.parquet"), GateTasks.Engine.Demo.DemoScenarioParameters.FullSimulation,
            200_000, 4242, GateTasks.Engine.Demo.DemoSampleWriter.DefaultRowGroupSize);
        var (third, rerun) = p.Build(glob, "-v:d");
        Assert.True(third == 0, rerun);
        Assert.DoesNotContain("are as last listed", rerun);
        static long Events(string output) => long.Parse(System.Text.RegularExpressions.Regex.Match(output, @"(\d+) surrogate events").Groups[1].Value);
        Assert.True(Events(rerun) > Events(first), rerun);

        // A copy of a shard under another name is the same shard, not more events: the build fails naming both files
        // (GATE2204, docs/error-codes.md), and the report says so.
        File.Copy(Path.Combine(shards, "part-1.parquet"), Path.Combine(shards, "part-3.parquet"));
        var (fourth, copied) = p.Build(glob);
        Assert.NotEqual(0, fourth);
        Assert.True(Regex.IsMatch(copied, @"part-3\.parquet ?: error GATE2204: sample files '[^']*part-1\.parquet' and '[^']*part-3\.parquet' have the same content"), copied);
        Assert.Contains("GATE2204", File.ReadAllText(p.JUnitReport));
    }

    [Fact]
    public void Drifted_sample_fails_the_build_at_the_contract_lines_with_a_junit_report()
    {
        var p = GateProject.Create(feed, "DriftedGate");
        var (code, output) = p.Build("-p:GateSample=surrogate-drifted.parquet");
        Assert.NotEqual(0, code);
        Assert.Matches(new Regex(@"precision-contract\.yaml\(37,13\): error GATE3004: feature 'm_gg' ratio-max\[core\]"), output);
        Assert.Matches(new Regex(@"precision-contract\.yaml\(\d+,\d+\): error GATE3005: feature 'm_gg' ratio-max\[tails\]"), output);
        Assert.Contains("FAILED: 62 of 77 checks", output);
        Assert.DoesNotContain("   at ", output); // no stack trace
        var junit = XDocument.Load(p.JUnitReport);
        Assert.Equal("15", junit.Root!.Attribute("failures")!.Value); // 10 failed + 5 inconclusive (which fail by default)
        Assert.Contains("| `m_gg` | ratio-max | core |", File.ReadAllText(Path.Combine(p.ReportDirectory, "precision-contract.md")));

        // A failing check leaves no stamp: the next build checks again rather than passing silently.
        var (again, second) = p.Build("-p:GateSample=surrogate-drifted.parquet");
        Assert.NotEqual(0, again);
        Assert.Contains("error GATE3004", second);
    }

    [Fact]
    public void Failures_as_warnings_keep_the_build_green_and_say_what_failed()
    {
        var p = GateProject.Create(feed, "WarnGate");
        var (code, output) = p.Build("-p:GateSample=surrogate-drifted.parquet", "-p:GateFailuresAsWarnings=true");
        Assert.True(code == 0, output);
        Assert.Matches(new Regex(@"precision-contract\.yaml\(37,13\): warning GATE3004"), output);
        Assert.DoesNotContain("error GATE3", output);
    }

    [Fact]
    public void The_gate_can_be_switched_off_and_limited_to_CI_and_run_alone()
    {
        var p = GateProject.Create(feed, "SwitchGate");
        var (off, offOutput) = p.Build("-p:GateEnabled=false", "-p:GateSample=surrogate-drifted.parquet");
        Assert.True(off == 0, offOutput);
        Assert.DoesNotContain("GATE3", offOutput);
        Assert.False(File.Exists(p.JUnitReport));

        var (local, localOutput) = p.Build("-p:GateOnlyInCI=true", "-p:GateSample=surrogate-drifted.parquet");
        Assert.True(local == 0, localOutput);
        Assert.False(File.Exists(p.JUnitReport));

        var (ci, ciOutput) = p.Build("-p:GateOnlyInCI=true", "-p:ContinuousIntegrationBuild=true", "-p:GateSample=surrogate-drifted.parquet");
        Assert.NotEqual(0, ci);
        Assert.Contains("error GATE3004", ciOutput);

        var (alone, aloneOutput) = p.Build("-t:GateCheck");
        Assert.True(alone == 0, aloneOutput);
        Assert.Contains("PASSED: 77 of 77 checks", aloneOutput);
    }

    [Fact]
    public void A_contract_error_is_an_msbuild_error_at_its_line_even_in_warning_mode()
    {
        var p = GateProject.Create(feed, "BrokenGate");
        var contract = Path.Combine(p.Directory, "precision-contract.yaml");
        File.WriteAllText(contract, File.ReadAllText(contract).Replace("ks-max: 0.01", "ks-mx: 0.01"));
        var (code, output) = p.Build("-p:GateFailuresAsWarnings=true");
        Assert.NotEqual(0, code);
        Assert.True(Regex.IsMatch(output, @"precision-contract\.yaml\(34,5\): error GATE1003: Unknown key 'ks-mx'.*did you mean 'ks-max'"), output);
    }

    [Fact]
    public void A_tab_in_the_contract_is_an_msbuild_error_at_the_tab_and_a_passing_report_gives_the_flow_shares()
    {
        // The corpus case yaml-tab-indentation (tests/corpus), through the build step: the error is placed at the tab
        // (YamlDotNet itself gives no position for it), as documented in docs/error-codes.md (GATE1002).
        var p = GateProject.Create(feed, "TabGate");
        var contract = Path.Combine(p.Directory, "precision-contract.yaml");
        var text = File.ReadAllText(contract);
        File.WriteAllText(contract, text.Replace("\n    ks-max: 0.01", "\n\tks-max: 0.01"));
        var (code, output) = p.Build();
        Assert.NotEqual(0, code);
        Assert.True(Regex.IsMatch(output, @"precision-contract\.yaml\(34,1\): error GATE1002: .*A tab indents this line"), output);

        File.WriteAllText(contract, text);
        var (passed, passedOutput) = p.Build();
        Assert.True(passed == 0, passedOutput);
        // docs/cli.md: the JUnit system-out holds the table of shares outside the bins.
        var junit = File.ReadAllText(p.JUnitReport);
        Assert.True(Regex.IsMatch(junit, @"outside the bins +reference below +above +sample below +above"), junit[Math.Max(0, junit.Length - 6000)..]);
    }

    [Fact]
    public void A_sample_error_is_an_msbuild_error_at_the_file_line_and_column_with_a_report_that_says_so()
    {
        // The corpus case csv-cell-not-a-number (tests/corpus), through the build step instead of the program.
        var p = GateProject.Create(feed, "BadCellGate");
        var columns = GateTasks.Engine.Demo.DemoColumns.All;
        var good = string.Join(',', columns.Select(_ => "1"));
        var bad = string.Join(',', columns.Select((_, i) => i == 1 ? "high" : "1"));
        File.WriteAllText(Path.Combine(p.Directory, "words.csv"), $"{string.Join(',', columns)}\n{good}\n{bad}\n");
        var (code, output) = p.Build("-p:GateSample=words.csv", "-p:GateFailuresAsWarnings=true");
        Assert.NotEqual(0, code);
        Assert.True(Regex.IsMatch(output, $@"words\.csv\(3,3\): error GATE2006: 'high' in column '{columns[1]}'"), output);
        Assert.Contains("GATE2006", File.ReadAllText(p.JUnitReport));
    }

    [Fact]
    public void A_missing_weight_is_an_msbuild_error_at_its_cell()
    {
        // The corpus case weight-missing (tests/corpus), through the build step: the demo contract weighs events by
        // the column 'weight', left empty on line 3. Expected: docs/error-codes.md, GATE2007 at the cell.
        var p = GateProject.Create(feed, "MissingWeightGate");
        var columns = GateTasks.Engine.Demo.DemoColumns.All;
        var weight = columns.ToList().IndexOf(GateTasks.Engine.Demo.DemoColumns.Weight);
        var good = string.Join(',', columns.Select(_ => "1"));
        var bad = string.Join(',', columns.Select((_, i) => i == weight ? "" : "1"));
        File.WriteAllText(Path.Combine(p.Directory, "unweighed.csv"), $"{string.Join(',', columns)}\n{good}\n{bad}\n");
        var (code, output) = p.Build("-p:GateSample=unweighed.csv", "-p:GateFailuresAsWarnings=true");
        Assert.NotEqual(0, code);
        Assert.True(Regex.IsMatch(output, $@"unweighed\.csv\(3,{2 * weight + 1}\): error GATE2007: weight column 'weight' holds an empty cell \(a missing value\)"), output);
        Assert.Contains("GATE2007", File.ReadAllText(p.JUnitReport));
    }

    [Fact]
    public void An_undecided_run_warns_says_UNDECIDED_never_PASSED_and_is_checked_again()
    {
        // The demo's contract with inconclusive checks that only warn (and no ledger: a warning), over a faithful sample
        // of 3 000 events: too few to decide every check, none drifted.
        var p = GateProject.Create(feed, "UndecidedGate");
        var contract = Path.Combine(p.Directory, "precision-contract.yaml");
        File.WriteAllText(contract, File.ReadAllText(contract).Replace("inconclusive: fail", "inconclusive: warn"));
        File.Delete(Path.Combine(p.Directory, "precision-contract.ledger"));
        GateTasks.Engine.Demo.DemoSampleWriter.Write(Path.Combine(p.Directory, "small.parquet"), GateTasks.Engine.Demo.DemoScenarioParameters.FullSimulation,
            3_000, 32, 1_000);
        var stamp = Path.Combine(p.Directory, "obj", "gate", "passed.stamp");

        // docs/msbuild.md: an undecided run is a warning per inconclusive check at its line; the build goes on, its
        // verdict line says UNDECIDED, and it leaves no passed stamp, so the next build checks again.
        var (code, output) = p.Build("-p:GateSample=small.parquet");
        Assert.True(code == 0, output);
        Assert.Matches(@"precision-contract\.yaml\(\d+,\d+\): warning GATE3100: ", output);
        Assert.DoesNotContain("error GATE", output);
        Assert.Matches(new Regex(@"^\s*UNDECIDED: \d+ of 77 checks within tolerance, 0 failed", RegexOptions.Multiline), output);
        Assert.DoesNotMatch(new Regex(@"^\s*PASSED:", RegexOptions.Multiline), output);
        Assert.StartsWith("### GateTasks check UNDECIDED", File.ReadAllText(Path.Combine(p.ReportDirectory, "precision-contract.md")));
        Assert.Contains("data-verdict=\"undecided\"", File.ReadAllText(Path.Combine(p.ReportDirectory, "precision-contract.html")));
        Assert.False(File.Exists(stamp), output);

        var (again, second) = p.Build("-p:GateSample=small.parquet");
        Assert.True(again == 0, second);
        Assert.DoesNotContain("up to date, the check is skipped", second);
        Assert.Matches(new Regex(@"^\s*UNDECIDED: ", RegexOptions.Multiline), second);
    }

    [Fact]
    public void An_undecided_run_under_inconclusive_fail_fails_the_build_and_says_UNDECIDED_never_FAILED()
    {
        // The demo's contract as shipped (inconclusive: fail; no ledger: a warning) over a faithful sample of 3 000
        // events: too few to decide every check, none drifted.
        var p = GateProject.Create(feed, "UndecidedFailGate");
        File.Delete(Path.Combine(p.Directory, "precision-contract.ledger"));
        GateTasks.Engine.Demo.DemoSampleWriter.Write(Path.Combine(p.Directory, "small.parquet"), GateTasks.Engine.Demo.DemoScenarioParameters.FullSimulation,
            3_000, 32, 1_000);
        var stamp = Path.Combine(p.Directory, "obj", "gate", "passed.stamp");

        // docs/msbuild.md: with inconclusive: fail each inconclusive check is an error at its line and the build fails,
        // but the run is UNDECIDED (the engine's exit code 5), not FAILED: no tolerance was shown exceeded.
        var (code, output) = p.Build("-p:GateSample=small.parquet");
        Assert.True(code != 0, output);
        Assert.Matches(@"precision-contract\.yaml\(\d+,\d+\): error GATE3100: ", output);
        Assert.DoesNotMatch(@"error GATE30\d\d", output);
        Assert.Matches(new Regex(@"^\s*UNDECIDED: \d+ of 77 checks within tolerance, 0 failed", RegexOptions.Multiline), output);
        Assert.DoesNotMatch(new Regex(@"^\s*(PASSED|FAILED):", RegexOptions.Multiline), output);
        Assert.StartsWith("### GateTasks check UNDECIDED", File.ReadAllText(Path.Combine(p.ReportDirectory, "precision-contract.md")));
        Assert.Contains("data-verdict=\"undecided\"", File.ReadAllText(Path.Combine(p.ReportDirectory, "precision-contract.html")));
        Assert.Contains("name=\"gatetasks.outcome\" value=\"undecided\"", File.ReadAllText(p.JUnitReport));
        Assert.False(File.Exists(stamp), output);
    }

    [Fact]
    public void A_multi_targeted_project_checks_once()
    {
        var p = GateProject.Create(feed, "MultiGate");
        File.WriteAllText(p.ProjectFile, File.ReadAllText(p.ProjectFile)
            .Replace("<TargetFramework>net8.0</TargetFramework>", "<TargetFrameworks>net8.0;net9.0</TargetFrameworks>"));
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Single(Regex.Matches(output, "PASSED: 77 of 77 checks"));
        var (drift, driftOutput) = p.Build("-p:GateSample=surrogate-drifted.parquet");
        Assert.NotEqual(0, drift);
        Assert.Contains("error GATE3004", driftOutput);
    }

    [Fact]
    public void Another_package_loading_a_different_YamlDotNet_in_the_build_does_not_clash()
    {
        // Fixture.YamlTask loads YamlDotNet 13.7.1 into the MSBuild process before GateCheck; the engine uses 18.1.0
        // in its own process.
        var p = GateProject.Create(feed, "ClashGate", extraPackage: "Fixture.YamlTask");
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.True(output.Contains("fixture-yaml-task: read precision-contract.yaml with YamlDotNet 13."), output); // assembly version 13.0.0.0 of package 13.7.1
        Assert.Contains("PASSED: 77 of 77 checks", output);
        var (drift, driftOutput) = p.Build("-p:GateSample=surrogate-drifted.parquet");
        Assert.NotEqual(0, drift);
        Assert.Contains("error GATE3004", driftOutput);
    }
}
