extern alias task;

using System.Collections;
using System.Text.RegularExpressions;
using GateTasks.Engine.Diagnostics;
using GateTasks.Tests.Shared;
using Microsoft.Build.Framework;
using Microsoft.Build.Utilities;
using GateRun = task::GateTasks.MSBuild.GateRun;

namespace GateTasks.Package.Tests;

/// <summary>
/// Help links of the build step's errors and warnings. The expectation is the documented behaviour (docs/msbuild.md,
/// "Help links"; docs/error-codes.md: one row with an anchor per code); MSBuild's API carries the link in
/// <see cref="BuildErrorEventArgs.HelpLink"/> (Microsoft.Build.Framework 17.8).
/// </summary>
public class TaskHelpLinkTests
{
    private static readonly string ErrorCodesDoc = File.ReadAllText(Path.Combine(RepositoryRoot.Path, "docs", "error-codes.md"));

    [Fact]
    public void An_error_the_task_logs_links_to_its_codes_anchor_in_error_codes_md()
    {
        var dir = Directory.CreateTempSubdirectory("gatetasks-helplink-").FullName;
        try
        {
            var contract = Path.Combine(dir, "precision-contract.yaml");
            File.WriteAllText(contract, "version: 1\n");
            var engine = new RecordingBuildEngine();
            var run = new GateRun
            {
                BuildEngine = engine,
                Engine = Path.Combine(dir, "no-such-engine", "gatetasks.dll"),
                Contracts = [new TaskItem(contract)],
                ReportDirectory = Path.Combine(dir, "reports"),
                WorkingDirectory = dir,
            };
            Assert.False(run.Execute());
            var error = Assert.Single(engine.Errors);
            Assert.Equal("GATE0011", error.Code); // docs/error-codes.md: the engine is missing from the package
            Assert.Equal(PackageContentTests.RepositoryUrl() + "/blob/main/docs/error-codes.md#gate0011", error.HelpLink);
            Assert.Contains("<a id=\"gate0011\"></a>GATE0011", ErrorCodesDoc);
        }
        finally
        {
            Directory.Delete(dir, recursive: true);
        }
    }

    [Fact]
    public void Every_code_has_its_anchor_in_error_codes_md()
    {
        // The engine's codes, and the build step's own (the task and its targets use them as literals).
        var codes = typeof(ErrorCodes).GetFields().Where(f => f.IsLiteral).Select(f => (string)f.GetRawConstantValue()!).ToHashSet();
        var msbuild = Path.Combine(RepositoryRoot.Path, "src", "GateTasks.MSBuild");
        foreach (var file in Directory.EnumerateFiles(msbuild, "*.cs").Concat(Directory.EnumerateFiles(Path.Combine(msbuild, "build"))))
            foreach (Match m in Regex.Matches(File.ReadAllText(file), @"\bGATE\d{4}\b")) codes.Add(m.Value);
        Assert.Contains("GATE0010", codes);
        var missing = codes.Where(c => !ErrorCodesDoc.Contains($"<a id=\"{c.ToLowerInvariant()}\"></a>{c} |", StringComparison.Ordinal)).Order().ToList();
        Assert.True(missing.Count == 0, "docs/error-codes.md has no row with an anchor for " + string.Join(", ", missing));
    }

    [Fact]
    public void Every_error_and_warning_the_task_and_its_targets_log_passes_a_help_link()
    {
        var msbuild = Path.Combine(RepositoryRoot.Path, "src", "GateTasks.MSBuild");
        var calls = Directory.EnumerateFiles(msbuild, "*.cs")
            .SelectMany(f => Regex.Matches(File.ReadAllText(f), @"Log\.Log(Error|Warning)\([^;]*;").Select(m => (File: Path.GetFileName(f), Call: m.Value)))
            .ToList();
        Assert.NotEmpty(calls);
        Assert.All(calls, c => Assert.True(c.Call.Contains("ErrorCodeHelpLink.For(", StringComparison.Ordinal), $"{c.File}: {c.Call}"));
        var elements = Regex.Matches(File.ReadAllText(Path.Combine(msbuild, "build", "GateTasks.targets")), @"<(Error|Warning)\s[^>]*>").Select(m => m.Value).ToList();
        Assert.All(elements, e => Assert.Matches(@"HelpLink=""GATETASKS_DOCS_URL/error-codes\.md#gate\d{4}""", e));
    }

    /// <summary>A build engine that keeps what the task logs.</summary>
    private sealed class RecordingBuildEngine : IBuildEngine
    {
        public List<BuildErrorEventArgs> Errors { get; } = [];
        public List<BuildWarningEventArgs> Warnings { get; } = [];
        public bool ContinueOnError => false;
        public int LineNumberOfTaskNode => 0;
        public int ColumnNumberOfTaskNode => 0;
        public string ProjectFileOfTaskNode => "test.proj";
        public void LogErrorEvent(BuildErrorEventArgs e) => Errors.Add(e);
        public void LogWarningEvent(BuildWarningEventArgs e) => Warnings.Add(e);
        public void LogMessageEvent(BuildMessageEventArgs e) { }
        public void LogCustomEvent(CustomBuildEventArgs e) { }
        public bool BuildProjectFile(string projectFileName, string[] targetNames, IDictionary globalProperties, IDictionary targetOutputs) => false;
    }
}
