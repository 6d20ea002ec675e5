using GateTasks.Engine.Demo;

namespace GateTasks.Package.Tests;

/// <summary>An analysis repository made with 'dotnet new precision-gate', filled with the demo's data.</summary>
public sealed class GateProject
{
    private readonly PackageFeed _feed;

    private GateProject(PackageFeed feed, string directory, string name)
    {
        _feed = feed;
        Directory = directory;
        Name = name;
    }

    public string Directory { get; }
    public string Name { get; }
    public string ProjectFile => Path.Combine(Directory, Name + ".csproj");
    public string ReportDirectory => Path.Combine(Directory, "gate-reports");
    public string JUnitReport => Path.Combine(ReportDirectory, "precision-contract.junit.xml");

    public static GateProject Create(PackageFeed feed, string name, string? extraPackage = null, string? directory = null)
    {
        var dir = directory ?? Path.Combine(feed.Root, "projects", name);
        feed.Dotnet(feed.Root, "new", "precision-gate", "-n", name, "-o", dir, "--debug:custom-hive", feed.Hive);
        File.WriteAllText(Path.Combine(dir, "nuget.config"), $"""
            <?xml version="1.0" encoding="utf-8"?>
            <configuration>
              <packageSources>
                <clear />
                <add key="e2e" value="{feed.Feed}" />
                <add key="nuget.org" value="https://api.nuget.org/v3/index.json" protocolVersion="3" />
              </packageSources>
            </configuration>
            """);
        // The demo's contract, samples and reference stand in for the analysis's own.
        File.WriteAllText(Path.Combine(dir, "precision-contract.yaml"), DemoContract.Text);
        foreach (var f in new[] { "surrogate-faithful.parquet", "surrogate-drifted.parquet", "precision-contract.ledger" })
            File.Copy(Path.Combine(feed.Demo, f), Path.Combine(dir, f));
        System.IO.Directory.CreateDirectory(Path.Combine(dir, "reference"));
        File.Copy(Path.Combine(feed.Demo, DemoContract.ReferenceFileName), Path.Combine(dir, DemoContract.ReferenceFileName));

        var project = new GateProject(feed, dir, name);
        if (extraPackage is not null)
        {
            var text = File.ReadAllText(project.ProjectFile);
            File.WriteAllText(project.ProjectFile, text.Replace("</ItemGroup>",
                $"""  <PackageReference Include="{extraPackage}" Version="{PackageFeed.Version}" PrivateAssets="all" />""" + "\n  </ItemGroup>"));
        }
        return project;
    }

    /// <summary>Runs 'dotnet build' on the project with extra arguments; never reuses build nodes.</summary>
    public (int ExitCode, string Output) Build(params string[] args) =>
        _feed.DotnetAllowingFailure(Directory, ["build", ProjectFile, "-nodeReuse:false", "--disable-build-servers", "-v:n", .. args]);
}
