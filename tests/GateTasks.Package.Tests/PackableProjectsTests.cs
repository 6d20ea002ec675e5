using GateTasks.Tests.Shared;

namespace GateTasks.Package.Tests;

/// <summary>
/// Only the three packages are packable, so packing the solution builds neither the tests nor the benchmarks
/// (DEVELOPERS.md, "Packages"). Reads each project's evaluated IsPackable with `dotnet msbuild -getProperty`.
/// </summary>
public class PackableProjectsTests
{
    [Fact]
    public void Only_the_three_package_projects_of_the_solution_are_packable()
    {
        var root = RepositoryRoot.Path;
        var projects = Directory.EnumerateFiles(Path.Combine(root, "src"), "*.csproj", SearchOption.AllDirectories)
            .Concat(Directory.EnumerateFiles(Path.Combine(root, "templates"), "*.csproj", SearchOption.AllDirectories))
            .Concat(Directory.EnumerateDirectories(Path.Combine(root, "tests"), "GateTasks.*").SelectMany(d => Directory.EnumerateFiles(d, "*.csproj")))
            .Where(p => !p.Split(Path.DirectorySeparatorChar).Any(s => s is "bin" or "obj"))
            .ToList();
        var packable = new List<string>();
        foreach (var project in projects)
        {
            var (code, stdout, stderr) = ProcessRunner.Run("dotnet", ["msbuild", project, "-getProperty:IsPackable", "-nodeReuse:false"], root, new Dictionary<string, string>(), timeoutSeconds: 120);
            Assert.True(code == 0, stderr + stdout);
            if (stdout.Trim() == "true") packable.Add(Path.GetFileNameWithoutExtension(project));
        }
        Assert.Contains("GateTasks.Engine.Tests", projects.Select(Path.GetFileNameWithoutExtension));
        Assert.Contains("GateTasks.Benchmarks", projects.Select(Path.GetFileNameWithoutExtension));
        Assert.Equal(["GateTasks.Cli", "GateTasks.MSBuild", "GateTasks.Templates"], packable.Order().ToArray());
    }
}
