using System.Text.RegularExpressions;
using System.Xml.Linq;

namespace GateTasks.Package.Tests;

/// <summary>
/// The build step never leaves a pass standing that it did not earn: not after an input error, not for a file
/// copied in with an old time, not under 'dotnet build -f', not for a contract whose reports another overwrote.
/// The expectations are the documented behaviour (docs/msbuild.md, docs/error-codes.md).
/// </summary>
[Collection(PackageCollection.Name)]
public class StaleVerdictTests(PackageFeed feed)
{
    private static readonly string[] Kinds = [".junit.xml", ".txt", ".html", ".md"];

    // Documented: on any input error the JUnit report is the "did not finish" form (one test in error, the code as type).
    private static void AssertUnfinishedJUnit(string path, string code)
    {
        Assert.True(File.Exists(path), $"no JUnit report at {path}");
        var root = XDocument.Load(path).Root!;
        Assert.Equal("1", root.Attribute("errors")!.Value);
        Assert.Equal(code, root.Descendants("error").Single().Attribute("type")!.Value);
    }

    private static void AssertNoReportSaysPassed(string reportBase)
    {
        foreach (var ending in Kinds)
        {
            var file = reportBase + ending;
            if (File.Exists(file)) Assert.DoesNotContain("PASSED", File.ReadAllText(file));
        }
    }

    [Fact]
    public void A_wrong_GateSample_replaces_the_passed_reports_with_ones_that_say_the_check_did_not_finish()
    {
        var p = GateProject.Create(feed, "WrongSampleGate");
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        var reportBase = Path.Combine(p.ReportDirectory, "precision-contract");
        Assert.Contains("PASSED", File.ReadAllText(reportBase + ".md"));

        (code, output) = p.Build("-p:GateSample=no-such-sample.parquet");
        Assert.NotEqual(0, code);
        // The error points at the project (where GateSample is set), not at the package's targets file, and says so.
        Assert.Matches(new Regex(@"WrongSampleGate\.csproj\s*: error GATE2001: sample 'no-such-sample\.parquet' does not exist.*GateSample property"), output);
        Assert.DoesNotContain("GateTasks.targets(", output);
        AssertUnfinishedJUnit(p.JUnitReport, "GATE2001");
        AssertNoReportSaysPassed(reportBase);
    }

    [Fact]
    public void A_missing_engine_leaves_an_unfinished_JUnit_and_no_report_that_says_passed()
    {
        var p = GateProject.Create(feed, "NoEngineGate");
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        var reportBase = Path.Combine(p.ReportDirectory, "precision-contract");
        Assert.Contains("PASSED", File.ReadAllText(reportBase + ".txt"));

        // A global property outranks the package's own value: the task looks for the engine where there is none.
        (code, output) = p.Build($"-p:_GateEngine={Path.Combine(p.Directory, "no-engine", "gatetasks.dll")}");
        Assert.NotEqual(0, code);
        Assert.Contains("error GATE0011", output);
        AssertUnfinishedJUnit(p.JUnitReport, "GATE0011");
        AssertNoReportSaysPassed(reportBase);
    }

    [Fact]
    public void A_missing_contract_sample_in_a_fresh_workspace_writes_the_unfinished_JUnit_and_names_the_contract_line()
    {
        var p = GateProject.Create(feed, "FreshMissingGate");
        File.Delete(Path.Combine(p.Directory, "surrogate-faithful.parquet"));
        Assert.False(Directory.Exists(p.ReportDirectory));
        var (code, output) = p.Build();
        Assert.NotEqual(0, code);
        Assert.Matches(new Regex(@"precision-contract\.yaml\(\d+,\d+\): error GATE2001: "), output);
        AssertUnfinishedJUnit(p.JUnitReport, "GATE2001");
    }

    [Fact]
    public void A_run_that_fails_on_the_ledger_prints_no_PASSED_line()
    {
        var p = GateProject.Create(feed, "LedgerLogGate");
        var contract = Path.Combine(p.Directory, "precision-contract.yaml");
        File.WriteAllText(contract, File.ReadAllText(contract).Replace("      width-ratio-max: 0.01", "      width-ratio-max: 0.02"));
        var (code, output) = p.Build();
        Assert.NotEqual(0, code);
        Assert.Contains("error GATE4003", output);
        Assert.DoesNotMatch(new Regex(@"^\s*PASSED:", RegexOptions.Multiline), output);
        Assert.Contains("NOT ACCEPTED", output);
    }

    [Fact]
    public void A_drifted_sample_or_loosened_contract_copied_in_with_an_old_time_is_checked_again()
    {
        var p = GateProject.Create(feed, "OldTimeGate");
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Contains("PASSED: 77 of 77 checks", output);

        // cp -p of the drifted sample over the faithful one, then its time set back (touch -d): only the content changed.
        var sample = Path.Combine(p.Directory, "surrogate-faithful.parquet");
        var old = new DateTime(2001, 1, 1, 0, 0, 0, DateTimeKind.Utc);
        File.Copy(Path.Combine(p.Directory, "surrogate-drifted.parquet"), sample, overwrite: true);
        File.SetLastWriteTimeUtc(sample, old);
        (code, output) = p.Build();
        Assert.NotEqual(0, code);
        Assert.Contains("error GATE3004", output);

        // Back to the faithful content (old time again): passes; and a rebuild with nothing changed is skipped.
        File.Copy(Path.Combine(feed.Demo, "surrogate-faithful.parquet"), sample, overwrite: true);
        File.SetLastWriteTimeUtc(sample, old);
        (code, output) = p.Build();
        Assert.True(code == 0, output);
        (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Contains("GateTasks: up to date, the check is skipped", output);

        // A loosened tolerance with the contract's old time restored: the ledger's GATE4003, not a skipped check.
        var contract = Path.Combine(p.Directory, "precision-contract.yaml");
        var time = File.GetLastWriteTimeUtc(contract);
        File.WriteAllText(contract, File.ReadAllText(contract).Replace("      width-ratio-max: 0.01", "      width-ratio-max: 0.02"));
        File.SetLastWriteTimeUtc(contract, time);
        (code, output) = p.Build();
        Assert.NotEqual(0, code);
        Assert.Contains("error GATE4003", output);
    }

    [Fact]
    public void A_contract_pointed_at_another_sample_with_its_old_time_kept_lists_its_inputs_again()
    {
        // The list of inputs is cached per contract; a contract edited with its time restored must not reuse the old
        // list, or a later change to the sample it now names would go unseen.
        var p = GateProject.Create(feed, "CacheKeyGate");
        File.Copy(Path.Combine(p.Directory, "surrogate-faithful.parquet"), Path.Combine(p.Directory, "other.parquet"));
        var (code, output) = p.Build();
        Assert.True(code == 0, output);

        var contract = Path.Combine(p.Directory, "precision-contract.yaml");
        var time = File.GetLastWriteTimeUtc(contract);
        File.WriteAllText(contract, File.ReadAllText(contract).Replace("path: surrogate-faithful.parquet", "path: other.parquet"));
        File.SetLastWriteTimeUtc(contract, time);
        (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Contains("PASSED: 77 of 77 checks", output);

        // Now the sample the contract names drifts (with a new time even): the check must run and fail.
        File.Copy(Path.Combine(p.Directory, "surrogate-drifted.parquet"), Path.Combine(p.Directory, "other.parquet"), overwrite: true);
        (code, output) = p.Build();
        Assert.NotEqual(0, code);
        Assert.Contains("error GATE3004", output);
    }

    [Fact]
    public void Building_one_framework_of_a_multi_targeted_project_checks_once()
    {
        var p = GateProject.Create(feed, "OneFrameworkGate");
        File.WriteAllText(p.ProjectFile, File.ReadAllText(p.ProjectFile)
            .Replace("<TargetFramework>net8.0</TargetFramework>", "<TargetFrameworks>net8.0;net10.0</TargetFrameworks>"));
        var (code, output) = p.Build("-f", "net8.0", "-p:GateSample=surrogate-drifted.parquet");
        Assert.NotEqual(0, code);
        Assert.Single(Regex.Matches(output, @"FAILED: 62 of 77 checks"));

        (code, output) = p.Build("-f", "net10.0");
        Assert.True(code == 0, output);
        Assert.Single(Regex.Matches(output, "PASSED: 77 of 77 checks"));

        // The plain build of every framework checks once too (up to date now, so it says so once).
        (code, output) = p.Build("-p:GateSample=surrogate-drifted.parquet");
        Assert.NotEqual(0, code);
        Assert.Single(Regex.Matches(output, @"FAILED: 62 of 77 checks"));
    }

    [Fact]
    public void A_project_without_a_contract_warns_once_with_GATE0010()
    {
        var p = GateProject.Create(feed, "NoContractGate");
        File.Delete(Path.Combine(p.Directory, "precision-contract.yaml"));
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Matches(new Regex(@"warning GATE0010: GateTasks is referenced but no contract was found"), output);
        Assert.Contains("1 Warning(s)", output); // MSBuild repeats each warning in its summary; the count says once

        File.WriteAllText(p.ProjectFile, File.ReadAllText(p.ProjectFile)
            .Replace("<TargetFramework>net8.0</TargetFramework>", "<TargetFrameworks>net8.0;net10.0</TargetFrameworks>"));
        (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Contains("1 Warning(s)", output);
        Assert.Contains("warning GATE0010", output);
    }

    [Fact]
    public void Two_contracts_with_the_same_file_name_write_their_own_reports()
    {
        var p = GateProject.Create(feed, "TwinGate");
        // higgs/ judges the faithful sample, zee/ the drifted one (under the same sample name), each with the same
        // contract, reference and ledger.
        foreach (var (folder, sample) in new[] { ("higgs", "surrogate-faithful.parquet"), ("zee", "surrogate-drifted.parquet") })
        {
            var dir = Path.Combine(p.Directory, folder);
            Directory.CreateDirectory(Path.Combine(dir, "reference"));
            foreach (var f in new[] { "precision-contract.yaml", "precision-contract.ledger", GateTasks.Engine.Demo.DemoContract.ReferenceFileName })
                File.Copy(Path.Combine(p.Directory, f), Path.Combine(dir, f));
            File.Copy(Path.Combine(p.Directory, sample), Path.Combine(dir, "surrogate-faithful.parquet"));
        }
        File.Delete(Path.Combine(p.Directory, "precision-contract.yaml"));
        File.WriteAllText(p.ProjectFile, File.ReadAllText(p.ProjectFile).Replace("</Project>", """
              <ItemGroup>
                <GateContract Include="higgs/precision-contract.yaml;zee/precision-contract.yaml" />
              </ItemGroup>
              <Target Name="ShowGateReports" AfterTargets="GateCheck">
                <Message Importance="high" Text="gate-report %(GateReport.Kind) %(GateReport.Contract): %(GateReport.Identity)" />
              </Target>
            </Project>
            """));
        var (code, output) = p.Build("-p:GateFailuresAsWarnings=true");
        Assert.True(code == 0, output);

        var higgs = Path.Combine(p.ReportDirectory, "higgs.precision-contract");
        var zee = Path.Combine(p.ReportDirectory, "zee.precision-contract");
        Assert.Equal("0", XDocument.Load(higgs + ".junit.xml").Root!.Attribute("failures")!.Value);
        // The drifted demo: 10 failed + 5 inconclusive (delta_phi's wasserstein-max passes on the fine grid).
        Assert.Equal("15", XDocument.Load(zee + ".junit.xml").Root!.Attribute("failures")!.Value);
        Assert.StartsWith("### GateTasks check PASSED", File.ReadAllText(higgs + ".md"));
        Assert.StartsWith("### GateTasks check FAILED", File.ReadAllText(zee + ".md"));
        Assert.False(File.Exists(p.JUnitReport));
        // The items GateCheck returns name the same files, each with its contract.
        Assert.Contains($"gate-report junit {Path.Combine(p.Directory, "higgs", "precision-contract.yaml")}: {higgs}.junit.xml", output);
        Assert.Contains($"gate-report markdown {Path.Combine(p.Directory, "zee", "precision-contract.yaml")}: {zee}.md", output);
    }
}
