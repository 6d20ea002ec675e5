using System.Text.Json;
using System.Xml.Linq;
using GateTasks.Tests.Shared;

namespace GateTasks.Package.Tests;

/// <summary>
/// The template's <c>--package-source</c> option as a user gives it: any folder name must come out as a well-formed
/// nuget.config whose source is that folder, character for character.
/// </summary>
[Collection(PackageCollection.Name)]
public class TemplatePackageSourceTests(PackageFeed feed)
{
    [Fact]
    public void A_folder_name_with_xml_special_characters_gives_a_well_formed_nuget_config_naming_it_exactly()
    {
        // & < > and " must be escaped inside an attribute value (W3C XML 1.0, section 2.4 "Character Data and Markup"
        // and 3.1 production [10] AttValue); a parser then returns the original text. ! and # sit beside " in ASCII
        // and must pass unchanged.
        var folder = Path.Combine(feed.Root, "feeds", "a&b <c> \"d\" !#");
        var dir = Path.Combine(feed.Root, "projects", "SourceGate");
        feed.Dotnet(feed.Root, "new", "precision-gate", "-n", "SourceGate", "-o", dir, "--package-source", folder, "--debug:custom-hive", feed.Hive);

        var config = XDocument.Load(Path.Combine(dir, "nuget.config"));
        var source = Assert.Single(config.Descendants("add"));
        Assert.Equal(folder, (string?)source.Attribute("value"));
    }

    [Fact]
    public void A_project_carrying_the_package_in_a_committed_folder_restores_it_from_there_on_a_machine_without_the_feed()
    {
        // What the template's README tells CI users: the .nupkg in a folder of the project, and nuget.config naming
        // that folder by a relative path (NuGet reads it from the config file's folder).
        var p = GateProject.Create(feed, "CarriedGate");
        var generated = Path.Combine(feed.Root, "projects", "CarriedGateConfig");
        feed.Dotnet(feed.Root, "new", "precision-gate", "-n", "CarriedGate", "-o", generated, "--package-source", "packages", "--debug:custom-hive", feed.Hive);
        File.Copy(Path.Combine(generated, "nuget.config"), Path.Combine(p.Directory, "nuget.config"), overwrite: true);
        var carried = Path.Combine(p.Directory, "packages");
        Directory.CreateDirectory(carried);
        File.Copy(Path.Combine(feed.Feed, $"GateTasks.{PackageFeed.Version}.nupkg"), Path.Combine(carried, $"GateTasks.{PackageFeed.Version}.nupkg"));

        // A CI machine: a fresh home whose NuGet configuration knows only the registry, and an empty package folder.
        var home = Path.Combine(feed.Root, "ci-home");
        var packages = Path.Combine(feed.Root, "ci-packages");
        Directory.CreateDirectory(Path.Combine(home, ".nuget", "NuGet"));
        File.Copy(Path.Combine(RepositoryRoot.Path, "nuget.config"), Path.Combine(home, ".nuget", "NuGet", "NuGet.Config"));
        var (code, stdout, stderr) = ProcessRunner.Run("dotnet", ["build", p.ProjectFile, "-nodeReuse:false", "--disable-build-servers"],
            p.Directory, PackageFeed.ShellEnvironment(home, packages), timeoutSeconds: 600);
        Assert.True(code == 0, stdout + stderr);
        // NuGet records where it took each package in .nupkg.metadata.
        var metadata = Path.Combine(packages, "gatetasks", PackageFeed.Version, ".nupkg.metadata");
        var source = JsonDocument.Parse(File.ReadAllText(metadata)).RootElement.GetProperty("source").GetString()!;
        Assert.Equal(carried, Path.TrimEndingDirectorySeparator(source));
    }
}
