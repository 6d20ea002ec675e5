using GateTasks.Engine.Demo;
using GateTasks.Tests.Shared;

namespace GateTasks.Package.Tests;

/// <summary>
/// Once per test run: packs GateTasks, GateTasks.Templates and GateTasks.Cli from a copy of the sources into a temporary
/// feed with the README's own packing line (section "Installing from a local feed", run with a temporary home folder
/// in which the feed lands), and a fixture package beside them; installs the template into an isolated template hive,
/// and writes the demo data. Restores go to a package folder inside the temporary tree, so no stale package from an
/// earlier run can hide a change.
/// </summary>
public sealed class PackageFeed : IDisposable
{
    /// <summary>The version the README's packing line gives the packages: the repository's (Directory.Build.props).</summary>
    public static readonly string Version = RepositoryVersion();

    public PackageFeed()
    {
        Root = Directory.CreateTempSubdirectory("gatetasks-e2e-").FullName;
        Home = Path.Combine(Root, "home");
        Feed = Path.Combine(Home, "gatetasks-feed");
        Hive = Path.Combine(Root, "hive");
        Packages = Path.Combine(Root, "packages");
        Demo = Path.Combine(Root, "demo");
        Sources = Path.Combine(Root, "sources");

        CopySources(Sources);
        Directory.CreateDirectory(Home);
        var pack = ReadmeInstall.FromRepository().PackLine;
        var (packed, stdout, stderr) = ProcessRunner.Run("bash", ["-c", pack], Sources, ShellEnvironment(Home, Packages), timeoutSeconds: 900);
        if (packed != 0) throw new InvalidOperationException($"{pack} exited {packed}:\n{stdout}{stderr}");
        Pack(Path.Combine(Sources, "tests", "fixtures", "yaml-task"), Sources);

        Dotnet(Root, "new", "install", Path.Combine(Feed, $"GateTasks.Templates.{Version}.nupkg"), "--debug:custom-hive", Hive);

        var demo = new DemoRun(Demo);
        demo.WriteInputs();
        demo.BuildReference();
        demo.Check(demo.FaithfulPath, "faithful", accept: true); // the demo's ledger: its tolerances accepted
    }

    public string Root { get; }

    /// <summary>The home folder ($HOME) the README's packing line ran with; the feed is its 'gatetasks-feed'.</summary>
    public string Home { get; }

    /// <summary>The copy of the repository's sources the packages were packed from (a clone, for the README's lines).</summary>
    public string Sources { get; }

    public string Feed { get; }
    public string Hive { get; }
    public string Packages { get; }
    public string Demo { get; }

    /// <summary>The packaged engine as restored into this feed's package folder (after a first restore).</summary>
    public string Engine => Path.Combine(Packages, "gatetasks", Version, "tools", "net8.0", "gatetasks.dll");

    public IReadOnlyDictionary<string, string> Environment => new Dictionary<string, string>
    {
        ["NUGET_PACKAGES"] = Packages,
        ["DOTNET_CLI_HOME"] = Path.Combine(Root, "cli-home"),
    };

    /// <summary>Runs dotnet with the test environment; fails the test with the output when it exits non-zero.</summary>
    public (int ExitCode, string Output) Dotnet(string workingDirectory, params string[] args) => DotnetAllowingFailure(workingDirectory, args) switch
    {
        (0, var output) => (0, output),
        var (code, output) => throw new InvalidOperationException($"dotnet {string.Join(' ', args)} exited {code}:\n{output}"),
    };

    public (int ExitCode, string Output) DotnetAllowingFailure(string workingDirectory, params string[] args)
    {
        var (code, stdout, stderr) = ProcessRunner.Run("dotnet", args, workingDirectory, Environment, timeoutSeconds: 400);
        return (code, stdout + stderr);
    }

    /// <summary>
    /// The environment of a shell running the README's lines: the given home folder and package folder, and neither
    /// build nodes nor compiler servers that would outlive the command (they would hold its output open).
    /// </summary>
    public static IReadOnlyDictionary<string, string> ShellEnvironment(string home, string packages) => new Dictionary<string, string>
    {
        ["HOME"] = home,
        ["DOTNET_CLI_HOME"] = home,
        ["NUGET_PACKAGES"] = packages,
        ["DOTNET_CLI_USE_MSBUILD_SERVER"] = "0",
        ["UseSharedCompilation"] = "false",
    };

    public void Dispose()
    {
        try { Directory.Delete(Root, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
    }

    private void Pack(string project, string sources) =>
        Dotnet(sources, "pack", project, "-c", "Release", "-o", Feed, $"-p:Version={Version}", "-nodeReuse:false", "--disable-build-servers");

    /// <summary>A copy, so packing does not touch the build outputs this test run uses.</summary>
    private static void CopySources(string to)
    {
        var root = RepositoryRoot.Path;
        foreach (var f in new[] { "Directory.Build.props", "Directory.Build.targets", "Directory.Packages.props", "global.json", "nuget.config", "README.md", "GateTasks.sln", "GateTasks.Packages.slnf" })
            if (File.Exists(Path.Combine(root, f))) CopyFile(Path.Combine(root, f), Path.Combine(to, f));
        CopyFile(Path.Combine(root, "docs", "precision-contract.schema.json"), Path.Combine(to, "docs", "precision-contract.schema.json"));
        foreach (var folder in new[] { "src", "templates", Path.Combine("tests", "fixtures", "yaml-task") })
            CopyTree(Path.Combine(root, folder), Path.Combine(to, folder));
    }

    private static string RepositoryVersion() =>
        System.Xml.Linq.XDocument.Load(Path.Combine(RepositoryRoot.Path, "Directory.Build.props")).Descendants("Version").First().Value;

    private static void CopyTree(string from, string to)
    {
        foreach (var file in Directory.EnumerateFiles(from, "*", SearchOption.AllDirectories))
        {
            var relative = Path.GetRelativePath(from, file);
            var parts = relative.Split(Path.DirectorySeparatorChar);
            if (parts.Any(p => p is "bin" or "obj")) continue;
            CopyFile(file, Path.Combine(to, relative));
        }
    }

    private static void CopyFile(string from, string to)
    {
        Directory.CreateDirectory(Path.GetDirectoryName(to)!);
        File.Copy(from, to, overwrite: true);
    }
}

[CollectionDefinition(Name)]
public sealed class PackageCollection : ICollectionFixture<PackageFeed>
{
    public const string Name = "packed GateTasks";
}
