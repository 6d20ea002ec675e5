using System.Xml.Linq;

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
}
