using System.Diagnostics;
using System.Xml.Linq;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Demo;
using GateTasks.Engine.References;

namespace GateTasks.Cli.Tests;

/// <summary>
/// A report path never keeps an earlier verdict: a check that stops on bad input, or is killed, leaves reports that
/// say it did not finish (a JUnit error), never a pass. The JUnit files are read with System.Xml.Linq.
/// </summary>
public sealed class UnfinishedReportTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-unfinished-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    /// <summary>
    /// The demo's contract over a faithful sample of <paramref name="sampleEvents"/> events, with a reference from
    /// 200 000 others (seeds <paramref name="seed"/> and the next); the contract's path.
    /// </summary>
    private string DemoSetup(int seed, int sampleEvents, int rowGroup)
    {
        var contractPath = Path.Combine(_dir, DemoContract.FileName);
        File.WriteAllText(contractPath, DemoContract.Text.Replace("path: surrogate-faithful.parquet", "path: surrogate.parquet"));
        var contract = ContractLoader.Load(contractPath);
        var fullsim = Path.Combine(_dir, "fullsim.parquet");
        DemoSampleWriter.Write(fullsim, DemoScenarioParameters.FullSimulation, 200_000, seed, 50_000);
        ReferenceFile.Write(contract.ReferenceFullPath, ReferenceBuilder.Build(contract, [fullsim], contract.Sample.Weight, "test"));
        DemoSampleWriter.Write(Path.Combine(_dir, "surrogate.parquet"), DemoScenarioParameters.FullSimulation, sampleEvents, seed + 1, rowGroup);
        return contractPath;
    }

    // 'gatetasks check' in a process of its own (as a build runs it), its output read as it comes.
    private static (Process Process, Task<string> Out, Task<string> Err) StartCheck(string contractPath, params string[] reportOptions)
    {
        var psi = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in new[] { typeof(GateTasks.Cli.CliApp).Assembly.Location, "check", "--contract", contractPath }.Concat(reportOptions))
            psi.ArgumentList.Add(a);
        var process = Process.Start(psi)!;
        return (process, process.StandardOutput.ReadToEndAsync(), process.StandardError.ReadToEndAsync());
    }

    private static readonly string PassingJUnit =
        """<testsuites name="gatetasks" tests="1" failures="0" errors="0" skipped="0"><testsuite name="old" tests="1" failures="0" errors="0"><testcase classname="x" name="y" /></testsuite></testsuites>""";

    [Fact]
    public void A_check_stopped_by_bad_input_replaces_every_earlier_report_with_the_error()
    {
        var contract = Path.Combine(_dir, "precision-contract.yaml");
        File.WriteAllText(contract, DemoContract.Text.Replace("path: surrogate-faithful.parquet", "path: no-such-sample.parquet"));
        var junit = Path.Combine(_dir, "r.junit.xml");
        var text = Path.Combine(_dir, "r.txt");
        var markdown = Path.Combine(_dir, "r.md");
        var html = Path.Combine(_dir, "r.html");
        File.WriteAllText(junit, PassingJUnit);
        foreach (var f in new[] { text, markdown, html }) File.WriteAllText(f, "PASSED: everything (an earlier run)");

        var (code, stdout, stderr) = Cli.Run("check", "--contract", contract, "--junit", junit, "--text", text, "--markdown", markdown, "--html", html);

        Assert.True(code == 2, stdout + stderr);
        Assert.Contains("GATE2001", stderr);
        var root = XDocument.Load(junit).Root!;
        Assert.Equal("1", root.Attribute("errors")!.Value);
        var error = root.Descendants("error").Single();
        Assert.Equal("GATE2001", error.Attribute("type")!.Value);
        Assert.Contains("no-such-sample.parquet", error.Attribute("message")!.Value);
        Assert.StartsWith("DID NOT FINISH: ", File.ReadAllText(text)); // the outcome's word, as in the Markdown heading (docs/reports.md)
        Assert.StartsWith("### GateTasks check DID NOT FINISH", File.ReadAllText(markdown));
        Assert.Contains("did not finish", File.ReadAllText(html));
        foreach (var f in new[] { text, markdown, html }) Assert.DoesNotContain("PASSED", File.ReadAllText(f));
    }

    [Fact]
    public void Killing_a_check_mid_run_leaves_a_report_that_says_it_did_not_finish()
    {
        // A sample large enough that reading it takes seconds: the kill lands while the check reads.
        var contractPath = DemoSetup(seed: 31, sampleEvents: 3_000_000, rowGroup: 100_000);
        var junit = Path.Combine(_dir, "r.junit.xml");
        File.WriteAllText(junit, PassingJUnit);

        using var process = StartCheck(contractPath, "--junit", junit).Process;
        var clock = Stopwatch.StartNew();
        // The earlier report is deleted first, then the marker renamed into place: the path may briefly hold nothing.
        while (!(ReadIfThere(junit)?.Contains("GATE0003", StringComparison.Ordinal) ?? false) && clock.Elapsed < TimeSpan.FromSeconds(60))
            Thread.Sleep(20);
        Assert.False(process.HasExited, "the check finished before it could be killed; the sample is too small for this test");
        process.Kill(entireProcessTree: true);
        process.WaitForExit();

        var root = XDocument.Load(junit).Root!;
        Assert.Equal("1", root.Attribute("errors")!.Value);
        Assert.Equal("GATE0003", root.Descendants("error").Single().Attribute("type")!.Value);
        Assert.Contains("has not finished", root.Descendants("error").Single().Attribute("message")!.Value);
        Assert.Empty(Directory.EnumerateFiles(_dir, "*.tmp")); // nothing half-written beside it either
    }

    private static string? ReadIfThere(string path)
    {
        try { return File.ReadAllText(path); }
        catch (FileNotFoundException) { return null; }
    }

    [Fact]
    public async Task Two_checks_writing_one_report_folder_at_once_leave_whole_reports()
    {
        // Two builds of one project (say, two target frameworks or two CI jobs on a shared folder) check at the same
        // time into the same report paths: each report is renamed into place whole, so the survivor parses.
        var contractPath = DemoSetup(seed: 41, sampleEvents: 200_000, rowGroup: 50_000);
        var reports = Path.Combine(_dir, "reports");
        var runs = Enumerable.Range(0, 2).Select(_ => StartCheck(contractPath,
            "--junit", Path.Combine(reports, "gate.junit.xml"), "--html", Path.Combine(reports, "gate.html"), "--markdown", Path.Combine(reports, "gate.md"))).ToList();
        foreach (var (process, output, error) in runs)
        {
            using var timeout = new CancellationTokenSource(TimeSpan.FromMinutes(2));
            await process.WaitForExitAsync(timeout.Token);
            var said = await output + await error;
            Assert.True(process.ExitCode is 0 or 1 or 4 or 5, $"exit {process.ExitCode}: {said}"); // docs/cli.md: a finished run (5: undecided)
            process.Dispose();
        }

        var root = XDocument.Load(Path.Combine(reports, "gate.junit.xml")).Root!;
        Assert.Equal("0", root.Attribute("errors")!.Value); // a finished verdict, not the "did not finish" placeholder
        Assert.True(int.Parse(root.Attribute("tests")!.Value, System.Globalization.CultureInfo.InvariantCulture) > 50);
        Assert.EndsWith("</html>", File.ReadAllText(Path.Combine(reports, "gate.html")).TrimEnd());
        Assert.StartsWith("### GateTasks check", File.ReadAllText(Path.Combine(reports, "gate.md")));
        Assert.Empty(Directory.EnumerateFiles(reports, "*.tmp"));
    }
}
