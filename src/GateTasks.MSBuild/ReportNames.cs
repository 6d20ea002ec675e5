using System;
using System.Collections.Generic;
using System.IO;
using System.Linq;

namespace GateTasks.MSBuild;

/// <summary>
/// The report files of each contract: <c>NAME.junit.xml</c>, <c>NAME.txt</c>, <c>NAME.html</c> and <c>NAME.md</c> in
/// the report folder, NAME being the contract's file name without extension. Two contracts with the same name (in
/// different folders) would overwrite each other's reports, so theirs are named after the path relative to the
/// project instead, folders joined by dots (<c>higgs/precision-contract.yaml</c> →
/// <c>higgs.precision-contract.junit.xml</c>); if even those clash, a short digest of the full path is added.
/// </summary>
internal static class ReportNames
{
    /// <summary>The kinds of report, as the <c>Kind</c> metadata names them, with their file endings.</summary>
    public static readonly (string Kind, string Ending)[] Kinds =
        [("junit", ".junit.xml"), ("text", ".txt"), ("html", ".html"), ("markdown", ".md")];

    /// <summary>
    /// The report base path (folder and NAME) of each contract (full paths), in order. With no report folder each
    /// contract's reports go beside it, where names cannot clash.
    /// </summary>
    public static IReadOnlyList<string> For(IReadOnlyList<string> contracts, string? reportDirectory, string projectDirectory)
    {
        var plain = contracts.Select(c => Path.GetFileNameWithoutExtension(c)).ToList();
        if (string.IsNullOrEmpty(reportDirectory))
            return contracts.Select((c, i) => Path.Combine(Path.GetDirectoryName(c)!, plain[i])).ToList();

        // Names compared without case: the report folder may be on a file system that ignores it.
        var clashing = new HashSet<string>(plain.GroupBy(n => n, StringComparer.OrdinalIgnoreCase).Where(g => g.Count() > 1).Select(g => g.Key),
            StringComparer.OrdinalIgnoreCase);
        var names = contracts.Select((c, i) => clashing.Contains(plain[i]) ? Relative(c, projectDirectory) : plain[i]).ToList();
        var stillClashing = new HashSet<string>(names.GroupBy(n => n, StringComparer.OrdinalIgnoreCase).Where(g => g.Count() > 1).Select(g => g.Key),
            StringComparer.OrdinalIgnoreCase);
        return names
            .Select((n, i) => stillClashing.Contains(n) ? n + "." + new InputsDigest().Add(contracts[i]).Hex().Substring(0, 8) : n)
            .Select(n => Path.Combine(reportDirectory!, n))
            .ToList();
    }

    // The contract's path relative to the project, without extension, folders joined by dots; ".." reads "up".
    private static string Relative(string contract, string projectDirectory)
    {
        var withoutExtension = Path.Combine(Path.GetDirectoryName(contract)!, Path.GetFileNameWithoutExtension(contract));
        var relative = RelativePath(projectDirectory, withoutExtension);
        var parts = relative.Split([Path.DirectorySeparatorChar, Path.AltDirectorySeparatorChar], StringSplitOptions.RemoveEmptyEntries)
            .Select(p => p == ".." ? "up" : p.Replace(":", ""));
        return string.Join(".", parts);
    }

    // Path.GetRelativePath is not in netstandard2.0.
    private static string RelativePath(string from, string to)
    {
        var fromUri = new Uri(AppendSeparator(Path.GetFullPath(from)));
        var toUri = new Uri(Path.GetFullPath(to));
        if (fromUri.Scheme != toUri.Scheme) return to.TrimStart(Path.DirectorySeparatorChar, Path.AltDirectorySeparatorChar, ':');
        return Uri.UnescapeDataString(fromUri.MakeRelativeUri(toUri).ToString()).Replace('/', Path.DirectorySeparatorChar);
    }

    private static string AppendSeparator(string path) =>
        path.EndsWith(Path.DirectorySeparatorChar.ToString(), StringComparison.Ordinal) ? path : path + Path.DirectorySeparatorChar;
}
