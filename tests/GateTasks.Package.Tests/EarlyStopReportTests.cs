using System.Xml.Linq;

namespace GateTasks.Package.Tests;

/// <summary>
/// A build that stops before the gate runs (a compile error in the project) leaves no report that says PASSED; a
/// build whose check is up to date keeps the passing reports. The expectations are the documented behaviour
/// (docs/msbuild.md, "Reports when the build stops early").
/// </summary>
[Collection(PackageCollection.Name)]
public class EarlyStopReportTests(PackageFeed feed)
{
    private static readonly string[] Kinds = [".junit.xml", ".txt", ".html", ".md"];

    // A project that compiles C#, so a compile error stops the build before GateCheck.
    private static GateProject CompilingProject(PackageFeed feed, string name, string frameworks)
    {
        var p = GateProject.Create(feed, name);
        File.WriteAllText(p.ProjectFile, File.ReadAllText(p.ProjectFile)
            .Replace("Sdk=\"Microsoft.Build.NoTargets/3.7.0\"", "Sdk=\"Microsoft.NET.Sdk\"")
            .Replace("<TargetFramework>net8.0</TargetFramework>", frameworks));
        File.WriteAllText(Path.Combine(p.Directory, "Analysis.cs"), "namespace Analysis; public static class Cuts { public const double PtMin = 25.0; }\n");
        return p;
    }

    private static void AssertPassedReports(string reportBase)
    {
        foreach (var ending in Kinds) Assert.True(File.Exists(reportBase + ending), $"no report {reportBase + ending}");
        // A passing run's JUnit: tests and no failures or errors (JUnit XML as Ant writes it: testsuites/testsuite counts).
        var root = XDocument.Load(reportBase + ".junit.xml").Root!;
        Assert.NotEqual("0", root.Attribute("tests")!.Value);
        Assert.Equal("0", root.Attribute("failures")!.Value);
        Assert.Equal("0", root.Attribute("errors")!.Value);
        foreach (var ending in new[] { ".txt", ".html", ".md" }) Assert.Contains("PASSED", File.ReadAllText(reportBase + ending));
    }

    private static void AssertNoReportSaysPassed(string reportDirectory)
    {
        if (!Directory.Exists(reportDirectory)) return;
        foreach (var file in Directory.GetFiles(reportDirectory))
        {
            var text = File.ReadAllText(file);
            Assert.DoesNotContain("PASSED", text);
            if (file.EndsWith(".junit.xml", StringComparison.Ordinal))
            {
                // No suite that only passes: every suite left must hold a failure or an error.
                foreach (var suite in XDocument.Load(file).Descendants("testsuite"))
                    Assert.True(suite.Attribute("failures")!.Value != "0" || suite.Attribute("errors")!.Value != "0", $"{file} holds a passing suite");
            }
        }
    }

    [Theory]
    [InlineData("CompileErrorGate", "<TargetFramework>net8.0</TargetFramework>")]
    [InlineData("CompileErrorMultiGate", "<TargetFrameworks>net8.0;net10.0</TargetFrameworks>")]
    public void A_compile_error_leaves_no_passed_report_and_the_fixed_build_brings_them_back(string name, string frameworks)
    {
        var p = CompilingProject(feed, name, frameworks);
        var reportBase = Path.Combine(p.ReportDirectory, "precision-contract");
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        AssertPassedReports(reportBase);

        // A no-op build: the check is up to date and the passing reports stay.
        (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Contains("GateTasks: up to date, the check is skipped", output);
        AssertPassedReports(reportBase);

        // A compile error: the build stops before GateCheck; no report may still say PASSED.
        var source = Path.Combine(p.Directory, "Analysis.cs");
        var good = File.ReadAllText(source);
        File.WriteAllText(source, good.Replace("25.0;", "25.0"));
        (code, output) = p.Build();
        Assert.NotEqual(0, code);
        Assert.Contains("error CS1002", output);
        Assert.DoesNotContain("GateTasks: up to date", output);
        AssertNoReportSaysPassed(p.ReportDirectory);

        // Fixed: the inputs are those of the last passing check, so it is up to date and its reports are back.
        File.WriteAllText(source, good);
        (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Contains("GateTasks: up to date, the check is skipped", output);
        AssertPassedReports(reportBase);
    }

    [Fact]
    public void The_check_alone_when_up_to_date_keeps_the_passed_reports()
    {
        var p = CompilingProject(feed, "CheckAloneGate", "<TargetFramework>net8.0</TargetFramework>");
        var reportBase = Path.Combine(p.ReportDirectory, "precision-contract");
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        (code, output) = p.Build("-t:GateCheck");
        Assert.True(code == 0, output);
        Assert.Contains("GateTasks: up to date, the check is skipped", output);
        AssertPassedReports(reportBase);
    }

    [Fact]
    public void A_disabled_gate_or_a_design_time_build_leaves_the_reports_alone()
    {
        // Guards the conditions of the early step: with the gate off it must not touch the reports (documented:
        // GateEnabled=false, the gate does not run at all; design-time builds are skipped).
        var p = CompilingProject(feed, "DisabledGate", "<TargetFramework>net8.0</TargetFramework>");
        var reportBase = Path.Combine(p.ReportDirectory, "precision-contract");
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        var before = Kinds.Select(k => File.ReadAllBytes(reportBase + k)).ToList();
        var stateDir = Path.Combine(p.Directory, "obj", "gate");
        Directory.Delete(Path.Combine(stateDir, "passed-reports"), recursive: true); // so a restore could not hide a move

        foreach (var setting in new[] { "-p:GateEnabled=false", "-p:DesignTimeBuild=true" })
        {
            (code, output) = p.Build(setting);
            Assert.True(code == 0, output);
            Assert.DoesNotContain("GateTasks:", output);
            Assert.Equal(before, Kinds.Select(k => File.ReadAllBytes(reportBase + k)).ToList());
        }
    }
}
