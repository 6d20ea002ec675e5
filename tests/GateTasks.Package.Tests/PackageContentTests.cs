using System.IO.Compression;
using System.Text.RegularExpressions;
using System.Xml.Linq;
using GateTasks.Tests.Shared;

namespace GateTasks.Package.Tests;

/// <summary>
/// What the three packed packages hold, read from the .nupkg and .snupkg files the feed packed. The expectations are
/// NuGet's documented package layout and metadata (nuspec reference: repository, projectUrl, license, readme; symbol
/// packages: a .snupkg holding the .pdb files at the paths of their assemblies) and this repository's own settings
/// (Directory.Build.props, LICENSE, docs/error-codes.md).
/// </summary>
[Collection(PackageCollection.Name)]
public class PackageContentTests(PackageFeed feed)
{
    public static TheoryData<string> Packages => new() { "GateTasks", "GateTasks.Cli", "GateTasks.Templates" };

    [Theory]
    [MemberData(nameof(Packages))]
    public void Each_package_names_the_repository_the_project_page_and_the_licence_of_LICENSE(string id)
    {
        var metadata = Nuspec(id);
        var url = RepositoryUrl();
        var repository = metadata.Element(metadata.Name.Namespace + "repository");
        Assert.NotNull(repository);
        Assert.Equal("git", (string?)repository.Attribute("type"));
        Assert.Equal(url, (string?)repository.Attribute("url"));
        Assert.Equal(url, (string?)metadata.Element(metadata.Name.Namespace + "projectUrl"));
        var license = metadata.Element(metadata.Name.Namespace + "license");
        Assert.NotNull(license);
        Assert.Equal("expression", (string?)license.Attribute("type"));
        // LICENSE's first line names the licence; the SPDX identifier of the MIT License is "MIT" (spdx.org/licenses).
        Assert.StartsWith("MIT License", File.ReadAllText(Path.Combine(RepositoryRoot.Path, "LICENSE")));
        Assert.Equal("MIT", license.Value);
    }

    [Theory]
    [MemberData(nameof(Packages))]
    public void Each_package_has_its_own_readme_whose_links_work_outside_the_repository(string id)
    {
        var metadata = Nuspec(id);
        var readme = (string?)metadata.Element(metadata.Name.Namespace + "readme");
        Assert.Equal("README.md", readme);
        var text = Entry(Path.Combine(feed.Feed, $"{id}.{PackageFeed.Version}.nupkg"), readme!);
        Assert.NotNull(text);
        Assert.Contains($"# {id}", text);
        // Not the repository's README, which is far longer and links into docs/ relatively.
        Assert.DoesNotContain("## Quick start", text);
        Assert.DoesNotContain("GATETASKS_", text); // every token filled in when packed
        var links = Regex.Matches(text, @"\]\(([^)]*)\)").Select(m => m.Groups[1].Value).ToList();
        Assert.NotEmpty(links);
        Assert.All(links, link => Assert.StartsWith(RepositoryUrl(), link));
    }

    [Theory]
    [InlineData("GateTasks", "tasks/netstandard2.0/GateTasks.MSBuild.pdb")]
    [InlineData("GateTasks", "tools/net8.0/gatetasks.pdb")]
    [InlineData("GateTasks", "tools/net8.0/GateTasks.Engine.pdb")]
    [InlineData("GateTasks.Cli", "tools/net8.0/any/gatetasks.pdb")]
    [InlineData("GateTasks.Cli", "tools/net8.0/any/GateTasks.Engine.pdb")]
    public void A_symbols_package_lies_beside_each_package_of_assemblies_with_each_pdb_at_its_assembly(string id, string pdb)
    {
        var symbols = Path.Combine(feed.Feed, $"{id}.{PackageFeed.Version}.snupkg");
        Assert.True(File.Exists(symbols), $"no {Path.GetFileName(symbols)} in the feed");
        Assert.Contains(pdb, EntryNames(symbols));
        Assert.Contains(Path.ChangeExtension(pdb, ".dll"), EntryNames(Path.Combine(feed.Feed, $"{id}.{PackageFeed.Version}.nupkg")));
    }

    [Fact]
    public void The_template_package_has_no_assemblies_and_no_symbols_package()
    {
        Assert.DoesNotContain(EntryNames(Path.Combine(feed.Feed, $"GateTasks.Templates.{PackageFeed.Version}.nupkg")), n => n.EndsWith(".dll", StringComparison.Ordinal));
        Assert.False(File.Exists(Path.Combine(feed.Feed, $"GateTasks.Templates.{PackageFeed.Version}.snupkg")));
    }

    [Theory]
    [InlineData("GateTasks", "tools/")]
    [InlineData("GateTasks", "tasks/")]
    [InlineData("GateTasks.Cli", "tools/")]
    public void No_xml_documentation_ships_beside_the_engine_or_the_task(string id, string folder)
    {
        var names = EntryNames(Path.Combine(feed.Feed, $"{id}.{PackageFeed.Version}.nupkg")).Where(n => n.StartsWith(folder, StringComparison.Ordinal)).ToList();
        Assert.Contains(names, n => n.EndsWith(".dll", StringComparison.Ordinal));
        Assert.DoesNotContain(names, n => n.EndsWith("GateTasks.Engine.xml", StringComparison.Ordinal));
        // The only XML file a tool package needs is the SDK's DotnetToolSettings.xml.
        Assert.All(names.Where(n => n.EndsWith(".xml", StringComparison.Ordinal)), n => Assert.EndsWith("/DotnetToolSettings.xml", n));
    }

    [Fact]
    public void The_packed_targets_give_GATE0010_its_help_link()
    {
        var targets = Entry(Path.Combine(feed.Feed, $"GateTasks.{PackageFeed.Version}.nupkg"), "build/GateTasks.targets");
        Assert.NotNull(targets);
        var warning = XDocument.Parse(targets).Descendants().Single(e => e.Name.LocalName == "Warning" && (string?)e.Attribute("Code") == "GATE0010");
        Assert.Equal(RepositoryUrl() + "/blob/main/docs/error-codes.md#gate0010", (string?)warning.Attribute("HelpLink"));
        Assert.Contains("<a id=\"gate0010\"></a>GATE0010", File.ReadAllText(Path.Combine(RepositoryRoot.Path, "docs", "error-codes.md")));
    }

    [Theory]
    [InlineData("GateTasks", "tools/net8.0/")]
    [InlineData("GateTasks.Cli", "tools/net8.0/any/")]
    public void Each_library_of_the_engine_has_linux_x64_ReadyToRun_code_beside_it_that_the_deps_json_lists_for_that_rid_alone(string id, string folder)
    {
        var package = Path.Combine(feed.Feed, $"{id}.{PackageFeed.Version}.nupkg");
        var names = EntryNames(package);
        var libraries = names.Where(n => n.StartsWith(folder, StringComparison.Ordinal) && !n[folder.Length..].Contains('/') && n.EndsWith(".dll", StringComparison.Ordinal))
            .Select(n => n[folder.Length..]).Where(n => n != "gatetasks.dll").ToList();
        Assert.Contains("GateTasks.Engine.dll", libraries);
        Assert.Contains("Parquet.dll", libraries);
        // The host's dependency manifest (docs of the .NET host, "deps.json": runtimeTargets hold RID-specific assets,
        // used on a machine of that RID instead of the library's portable "runtime" assets).
        using var deps = System.Text.Json.JsonDocument.Parse(Entry(package, folder + "gatetasks.deps.json")!);
        var target = deps.RootElement.GetProperty("targets").EnumerateObject().Single().Value;
        foreach (var library in libraries)
        {
            var precompiled = $"runtimes/linux-x64/lib/net8.0/{library}";
            var entry = target.EnumerateObject().Single(l => l.Value.TryGetProperty("runtime", out var r) && r.EnumerateObject().Any(a => a.Name.EndsWith("/" + library, StringComparison.Ordinal) || a.Name == library)).Value;
            var listed = entry.GetProperty("runtimeTargets").GetProperty(precompiled);
            Assert.Equal("linux-x64", listed.GetProperty("rid").GetString());
            Assert.Equal("runtime", listed.GetProperty("assetType").GetString());
            // ECMA-335 II.25.3.3: a CLI header's ManagedNativeHeader is 0 in an IL-only file; ReadyToRun puts its header
            // there. The portable file stays IL only (it must load on every platform); the precompiled one is a Linux x64
            // image: machine 0x8664 (AMD64) XOR 0x7B79, the Linux mark of dotnet/runtime src/coreclr/inc/pedecoder.h.
            var (portableMachine, portableNative) = PeHeaders(package, folder + library);
            Assert.Equal(0, portableNative);
            var (machine, native) = PeHeaders(package, folder + precompiled);
            Assert.NotEqual(0, native);
            Assert.Equal(0x8664 ^ 0x7B79, machine);
            Assert.NotEqual(machine, portableMachine);
        }
    }

    private static (int Machine, int ManagedNativeHeaderSize) PeHeaders(string package, string name)
    {
        using var zip = ZipFile.OpenRead(package);
        var entry = zip.GetEntry(name);
        Assert.True(entry is not null, $"{name} is not in {Path.GetFileName(package)}");
        using var copy = new MemoryStream();
        using (var stream = entry.Open()) stream.CopyTo(copy);
        copy.Position = 0;
        using var pe = new System.Reflection.PortableExecutable.PEReader(copy);
        return ((int)pe.PEHeaders.CoffHeader.Machine, pe.PEHeaders.CorHeader!.ManagedNativeHeaderDirectory.Size);
    }

    /// <summary>The one repository address, as Directory.Build.props defines it.</summary>
    internal static string RepositoryUrl()
    {
        var props = XDocument.Load(Path.Combine(RepositoryRoot.Path, "Directory.Build.props"));
        var url = props.Descendants().SingleOrDefault(e => e.Name.LocalName == "GateTasksRepositoryUrl")?.Value;
        Assert.False(string.IsNullOrEmpty(url), "Directory.Build.props defines no GateTasksRepositoryUrl");
        return url!;
    }

    private XElement Nuspec(string id)
    {
        var package = Path.Combine(feed.Feed, $"{id}.{PackageFeed.Version}.nupkg");
        var text = Entry(package, $"{id}.nuspec");
        Assert.NotNull(text);
        var root = XDocument.Parse(text).Root!;
        return root.Element(root.Name.Namespace + "metadata")!;
    }

    private static List<string> EntryNames(string package)
    {
        using var zip = ZipFile.OpenRead(package);
        return zip.Entries.Select(e => e.FullName).ToList();
    }

    private static string? Entry(string package, string name)
    {
        using var zip = ZipFile.OpenRead(package);
        var entry = zip.GetEntry(name);
        if (entry is null) return null;
        using var reader = new StreamReader(entry.Open());
        return reader.ReadToEnd();
    }
}
