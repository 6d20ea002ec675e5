using System.Text.RegularExpressions;
using GateTasks.Tests.Shared;

namespace GateTasks.Package.Tests;

/// <summary>
/// The command lines of the README's section "Installing from a local feed", read from the README itself so that the
/// tests run what a reader copies: its first shell block (pack, install the template and the tool, put the tools on
/// PATH) and its second (make a gate project, try it on the demo's data).
/// </summary>
public sealed class ReadmeInstall
{
    public const string Heading = "### Installing from a local feed";

    private ReadmeInstall(IReadOnlyList<string> setup, IReadOnlyList<string> project)
    {
        SetupLines = setup;
        ProjectLines = project;
    }

    /// <summary>The first block's lines: the pack line first, which the package fixture runs in its copy of the sources.</summary>
    public IReadOnlyList<string> SetupLines { get; }

    /// <summary>The second block's lines, run in a fresh home folder.</summary>
    public IReadOnlyList<string> ProjectLines { get; }

    /// <summary>The line that packs the packages into the local feed.</summary>
    public string PackLine => SetupLines[0];

    public static ReadmeInstall Read(string readmePath)
    {
        var text = File.ReadAllText(readmePath).Replace("\r\n", "\n");
        var start = text.IndexOf("\n" + Heading + "\n", StringComparison.Ordinal);
        if (start < 0) throw new InvalidOperationException($"{readmePath} has no section '{Heading}'");
        var section = text[(start + Heading.Length + 2)..];
        var next = Regex.Match(section, @"\n#{1,3} ");
        if (next.Success) section = section[..next.Index];
        var blocks = Regex.Matches(section, @"```sh\n(.*?)```", RegexOptions.Singleline)
            .Select(m => m.Groups[1].Value.Split('\n').Where(l => l.Trim().Length > 0 && !l.TrimStart().StartsWith('#')).ToList())
            .ToList();
        if (blocks.Count < 2) throw new InvalidOperationException($"'{Heading}' in {readmePath} has {blocks.Count} shell blocks, not two");
        if (!blocks[0][0].StartsWith("dotnet pack ", StringComparison.Ordinal))
            throw new InvalidOperationException($"the first line of '{Heading}' does not pack the packages: {blocks[0][0]}");
        return new ReadmeInstall(blocks[0], blocks[1]);
    }

    public static ReadmeInstall FromRepository() => Read(Path.Combine(RepositoryRoot.Path, "README.md"));
}
