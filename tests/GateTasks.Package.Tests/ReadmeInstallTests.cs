using System.Text;
using System.Text.Json;
using System.Text.RegularExpressions;
using System.Xml.Linq;
using GateTasks.Tests.Shared;

namespace GateTasks.Package.Tests;

/// <summary>
/// The README's way from a machine with only the .NET SDK to a gate project: its lines of "Installing from a local
/// feed", run as written in one shell, on a home folder and package folder that start empty. The expectations are the
/// README's own statements (the first build succeeds, the second fails at the contract's lines with a JUnit report
/// saying the same) and docs/error-codes.md (GATE3004: a ratio tolerance exceeded in the core).
/// </summary>
[Collection(PackageCollection.Name)]
public class ReadmeInstallTests(PackageFeed feed)
{
    [Fact]
    public void The_readme_lines_install_from_the_local_feed_and_give_a_passing_then_a_failing_build()
    {
        var readme = ReadmeInstall.FromRepository();
        var home = feed.Home; // the fixture ran the README's packing line with this home: the feed is $HOME/gatetasks-feed
        Assert.True(File.Exists(Path.Combine(feed.Feed, $"GateTasks.{PackageFeed.Version}.nupkg")));
        // The machine's registries: the repository's own nuget.config as the user's NuGet configuration (nuget.org; CI
        // reaches it), so every package but GateTasks's must come from there.
        var userConfig = Path.Combine(home, ".nuget", "NuGet", "NuGet.Config");
        Directory.CreateDirectory(Path.GetDirectoryName(userConfig)!);
        File.Copy(Path.Combine(RepositoryRoot.Path, "nuget.config"), userConfig, overwrite: true);
        var packages = Path.Combine(home, ".nuget", "packages");
        Assert.False(Directory.Exists(packages) && Directory.EnumerateFileSystemEntries(packages).Any());

        // The rest of the first block runs in the clone (the copy the fixture packed from), the second wherever it says.
        var lines = readme.SetupLines.Skip(1).Select(l => (Line: l, InClone: true)).Concat(readme.ProjectLines.Select(l => (Line: l, InClone: false))).ToList();
        var snapshots = Path.Combine(feed.Root, "readme-junit");
        Directory.CreateDirectory(snapshots);
        var script = new StringBuilder("exec 2>&1\n").Append($"cd {Quote(feed.Sources)}\n");
        for (var i = 0; i < lines.Count; i++)
        {
            var last = i == lines.Count - 1;
            script.Append($"echo '@@step {i} start'\n{lines[i].Line}\n")
                .Append($"rc=$?; echo \"@@step {i} exit $rc\"\n")
                .Append($"if [ -f gate-reports/precision-contract.junit.xml ]; then cp gate-reports/precision-contract.junit.xml {Quote(snapshots)}/step-{i}.xml; fi\n");
            if (!last) script.Append("if [ $rc -ne 0 ]; then exit 90; fi\n");
        }
        var (code, stdout, stderr) = ProcessRunner.Run("bash", ["-c", script.ToString()], feed.Sources,
            PackageFeed.ShellEnvironment(home, packages), timeoutSeconds: 1800);
        var output = stdout + stderr;
        string Step(int i) => Regex.Match(output, $@"@@step {i} start\n(.*?)@@step {i} exit", RegexOptions.Singleline).Groups[1].Value;
        int Exit(int i) => Regex.Match(output, $@"@@step {i} exit (\d+)") is { Success: true } m ? int.Parse(m.Groups[1].Value) : -1;
        for (var i = 0; i < lines.Count - 1; i++)
            Assert.True(Exit(i) == 0, $"README line '{lines[i].Line}' exited {Exit(i)}:\n{output}");

        // The second-to-last line builds on the faithful sample: success, a JUnit report without a failure.
        var passing = lines.Count - 2;
        Assert.Equal("dotnet build", lines[passing].Line.Trim());
        Assert.Contains("Build succeeded", Step(passing));
        var passed = XDocument.Load(Path.Combine(snapshots, $"step-{passing}.xml")).Root!;
        Assert.Equal("0", passed.Attribute("failures")!.Value);
        Assert.Equal("0", passed.Attribute("errors")!.Value);
        Assert.NotEqual("0", passed.Attribute("tests")!.Value);

        // The last one builds on the drifted sample: the build fails at the contract's line, and so does the report.
        var failing = lines.Count - 1;
        Assert.True(Exit(failing) is not 0 and not -1, output);
        Assert.Matches(new Regex(@"precision-contract\.yaml\(37,13\): error GATE3004: feature 'm_gg' ratio-max\[core\]"), Step(failing));
        var failed = XDocument.Load(Path.Combine(snapshots, $"step-{failing}.xml")).Root!;
        Assert.NotEqual("0", failed.Attribute("failures")!.Value);
        Assert.Contains("GATE3004", failed.ToString());

        // GateTasks came from the local feed, Microsoft.Build.NoTargets from the registry of the repository's
        // nuget.config (NuGet records where it took each package in .nupkg.metadata).
        Assert.Equal(Path.TrimEndingDirectorySeparator(feed.Feed), Path.TrimEndingDirectorySeparator(Source(packages, "gatetasks", PackageFeed.Version)));
        var noTargets = Directory.GetDirectories(Path.Combine(packages, "microsoft.build.notargets")).Single();
        Assert.Equal("https://api.nuget.org/v3/index.json", Source(packages, "microsoft.build.notargets", Path.GetFileName(noTargets)));

        // The generated project's README gives the same tool line as the repository's README, and the accept step
        // before the first GATE4001.
        var project = Path.Combine(home, "GateTryout");
        var projectReadme = File.ReadAllText(Path.Combine(project, "README.md"));
        Assert.Contains(readme.SetupLines.Single(l => l.StartsWith("dotnet tool install ", StringComparison.Ordinal)), projectReadme);
        Assert.Contains(readme.SetupLines.Single(l => l.StartsWith("export PATH=", StringComparison.Ordinal)), projectReadme);
        Assert.True(projectReadme.IndexOf("gatetasks accept", StringComparison.Ordinal) is >= 0 and var accept
                    && accept < projectReadme.IndexOf("GATE4001", StringComparison.Ordinal), "the template's README names 'gatetasks accept' before GATE4001");
        Assert.Contains($"value=\"{feed.Feed}\"", File.ReadAllText(Path.Combine(project, "nuget.config")));
    }

    [Fact]
    public void Before_anything_is_accepted_the_build_warns_GATE4001_with_the_accept_command_the_template_readme_gave_first()
    {
        // docs/error-codes.md: GATE4001, no acceptance ledger, is a warning unless the contract requires acceptance.
        var p = GateProject.Create(feed, "FirstBuildGate");
        File.Delete(Path.Combine(p.Directory, "precision-contract.ledger"));
        var (code, output) = p.Build();
        Assert.True(code == 0, output);
        Assert.Matches(new Regex(@"warning GATE4001: No acceptance ledger at .*precision-contract\.ledger.*record it with: gatetasks accept "), output);
        var readme = File.ReadAllText(Path.Combine(p.Directory, "README.md"));
        Assert.Contains("gatetasks accept --reason", readme);
        Assert.True(readme.IndexOf("gatetasks accept", StringComparison.Ordinal) < readme.IndexOf("GATE4001", StringComparison.Ordinal));
        Assert.Contains("gatetasks accept", File.ReadAllText(p.ProjectFile));
    }

    private static string Source(string packages, string id, string version) =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(packages, id, version, ".nupkg.metadata"))).RootElement.GetProperty("source").GetString()!;

    private static string Quote(string path) => "'" + path.Replace("'", "'\\''") + "'";
}
