using GateTasks.Tests.Shared;

namespace GateTasks.Cli.Tests;

/// <summary>
/// Packs the CLI as a .NET tool from a copy of the sources into a temporary feed, installs it into a temporary
/// tool path as a user would, and runs the installed <c>gatetasks</c> command.
/// </summary>
public sealed class ToolPackageTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-tool-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    [Fact]
    public void The_packed_tool_installs_and_runs_as_gatetasks()
    {
        // A copy of the sources, so the pack does not touch the build outputs this test run is using.
        var src = Path.Combine(_dir, "src");
        foreach (var f in new[] { "Directory.Build.props", "Directory.Build.targets", "Directory.Packages.props", "global.json", "nuget.config", "README.md" })
            File.Copy(Path.Combine(RepositoryRoot.Path, f), Path.Combine(_dir, f));
        Copy(Path.Combine(RepositoryRoot.Path, "src", "GateTasks.Engine"), Path.Combine(src, "GateTasks.Engine"));
        Copy(Path.Combine(RepositoryRoot.Path, "src", "GateTasks.Cli"), Path.Combine(src, "GateTasks.Cli"));
        Directory.CreateDirectory(Path.Combine(_dir, "docs"));
        File.Copy(Path.Combine(RepositoryRoot.Path, "docs", "precision-contract.schema.json"), Path.Combine(_dir, "docs", "precision-contract.schema.json"));

        var feed = Path.Combine(_dir, "feed");
        // The pack compiles the native executable too (minutes, more on a busy machine): as long as the package feed allows.
        var pack = ProcessRunner.Run("dotnet", ["pack", Path.Combine(src, "GateTasks.Cli"), "-c", "Release", "-o", feed,
            "-p:Version=0.0.1-e2e", "--nologo", "-nodeReuse:false"], _dir, timeoutSeconds: 900);
        Assert.True(pack.ExitCode == 0, pack.Stdout + pack.Stderr);
        Assert.True(File.Exists(Path.Combine(feed, "GateTasks.Cli.0.0.1-e2e.nupkg")));

        var tools = Path.Combine(_dir, "tools");
        var install = ProcessRunner.Run("dotnet", ["tool", "install", "GateTasks.Cli", "--tool-path", tools,
            "--add-source", feed, "--version", "0.0.1-e2e"], _dir,
            new Dictionary<string, string> { ["NUGET_PACKAGES"] = Path.Combine(_dir, "packages") });
        Assert.True(install.ExitCode == 0, install.Stdout + install.Stderr);

        var run = ProcessRunner.Run(Path.Combine(tools, "gatetasks"), ["check", "--contract", "missing.yaml"], _dir);
        Assert.Equal(2, run.ExitCode);
        Assert.Contains("error GATE1001", run.Stderr);
        var version = ProcessRunner.Run(Path.Combine(tools, "gatetasks"), ["--version"], _dir);
        Assert.Contains("0.0.1-e2e", version.Stdout);
    }

    private static void Copy(string from, string to)
    {
        foreach (var file in Directory.EnumerateFiles(from, "*", SearchOption.AllDirectories))
        {
            var relative = Path.GetRelativePath(from, file);
            if (relative.StartsWith("bin" + Path.DirectorySeparatorChar) || relative.StartsWith("obj" + Path.DirectorySeparatorChar)) continue;
            var target = Path.Combine(to, relative);
            Directory.CreateDirectory(Path.GetDirectoryName(target)!);
            File.Copy(file, target);
        }
    }
}
