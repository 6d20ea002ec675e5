using GateTasks.Engine.Diagnostics;
using System.Text;
using System.Text.RegularExpressions;
using Microsoft.Extensions.FileSystemGlobbing;
using Microsoft.Extensions.FileSystemGlobbing.Abstractions;

namespace GateTasks.Engine.Samples;

/// <summary>Turns a sample argument (a file, a folder or a glob) into the list of files to read.</summary>
internal static class SampleFiles
{
    private static readonly StringComparison PathComparison =
        OperatingSystem.IsWindows() ? StringComparison.OrdinalIgnoreCase : StringComparison.Ordinal;

    /// <summary>
    /// The absolute paths <paramref name="pattern"/> names, sorted ordinally so every run reads files in the
    /// same order: a file; a folder's sample files (<c>.parquet</c>, <c>.pq</c>, <c>.csv</c>, <c>.npy</c>, <c>.npz</c>, <c>.h5</c>, <c>.hdf5</c>; not its subfolders); or a
    /// glob with <c>*</c>, <c>**</c> and <c>?</c>, which takes whatever files it matches. A relative pattern is
    /// relative to <paramref name="baseDirectory"/>. GATE2001 when nothing matches.
    /// </summary>
    public static IReadOnlyList<string> Resolve(string pattern, string baseDirectory)
    {
        if (string.IsNullOrWhiteSpace(pattern))
            throw new GateInputException(ErrorCodes.SampleNotFound, "no sample file given (the sample pattern is empty)");

        var (baseFull, combined, wildcard) = Absolute(pattern, baseDirectory);
        return wildcard < 0 ? ResolvePath(pattern, baseFull, combined) : ResolveGlob(pattern, baseFull, combined, wildcard);
    }

    /// <summary>
    /// The paths whose state decides what <paramref name="pattern"/> resolves to: a named file itself, a sample
    /// folder, or a glob's root folder with every folder below it. A file added to or removed from a folder changes
    /// the folder's last-write time, which is how the build step knows its list of inputs may have changed.
    /// </summary>
    public static IReadOnlyList<string> Dependencies(string pattern, string baseDirectory)
    {
        var (baseFull, combined, wildcard) = Absolute(pattern, baseDirectory);
        if (wildcard < 0) return [System.IO.Path.GetFullPath(combined)];
        var (root, _) = SplitGlob(baseFull, combined, wildcard);
        if (!Directory.Exists(root)) return [root];
        // Every folder below the root, walked as the glob walks it (links followed, each real folder once): a glob may
        // reach into any of them (conservative for globs without '**').
        var folders = new List<string> { root };
        var pending = new Stack<DirectoryInfoBase>();
        pending.Push(new LoopSafeDirectory(new DirectoryInfo(root)));
        while (pending.TryPop(out var folder))
            foreach (var sub in folder.EnumerateFileSystemInfos().OfType<DirectoryInfoBase>())
            {
                folders.Add(System.IO.Path.GetFullPath(sub.FullName));
                pending.Push(sub);
            }
        return [folders[0], .. folders.Skip(1).Order(StringComparer.Ordinal)];
    }

    // The pattern made absolute against the base folder, and where its first wildcard is (−1: none).
    private static (string BaseFull, string Combined, int Wildcard) Absolute(string pattern, string baseDirectory)
    {
        var baseFull = System.IO.Path.GetFullPath(baseDirectory);
        var combined = System.IO.Path.IsPathRooted(pattern) ? pattern : System.IO.Path.Combine(baseFull, pattern);
        return (baseFull, combined, combined.IndexOfAny(['*', '?']));
    }

    // The part before the first wildcard's folder is a plain path: the root the glob is matched under; the rest is
    // the glob relative to it.
    private static (string Root, string Relative) SplitGlob(string baseFull, string combined, int wildcard)
    {
        var separator = combined.LastIndexOfAny(Separators, wildcard);
        var root = System.IO.Path.TrimEndingDirectorySeparator(System.IO.Path.GetFullPath(separator < 0 ? baseFull : combined[..(separator + 1)]));
        return (root, combined[(separator + 1)..]);
    }

    private static string[] ResolvePath(string pattern, string baseFull, string combined)
    {
        var full = System.IO.Path.GetFullPath(combined);
        if (File.Exists(full)) return [full];
        if (!Directory.Exists(full))
            throw new GateInputException(ErrorCodes.SampleNotFound,
                $"sample '{pattern}' does not exist (looked for '{full}', relative to '{baseFull}')");

        var files = Directory.EnumerateFiles(full)
            .Where(f => SampleFormats.ByExtension(System.IO.Path.GetExtension(f)) is not null)
            .Select(System.IO.Path.GetFullPath)
            .Order(StringComparer.Ordinal)
            .ToArray();
        if (files.Length == 0)
            throw new GateInputException(ErrorCodes.SampleNotFound,
                $"sample folder '{full}' holds no sample files ({string.Join(", ", SampleFormats.Extensions)})");
        return files;
    }

    private static string[] ResolveGlob(string pattern, string baseFull, string combined, int wildcard)
    {
        var (root, relative) = SplitGlob(baseFull, combined, wildcard);
        if (OperatingSystem.IsWindows()) relative = relative.Replace('\\', '/');

        string[] files = [];
        if (Directory.Exists(root))
        {
            // The globbing library knows '*' and '**' but not '?': match with '*' in its place, then keep the
            // paths the exact pattern accepts.
            var matcher = new Matcher(PathComparison);
            matcher.AddInclude(relative.Replace('?', '*'));
            var exact = GlobRegex(relative);
            files = matcher.Execute(new LoopSafeDirectory(new DirectoryInfo(root))).Files
                .Where(match => exact.IsMatch(match.Path))
                .Select(match => System.IO.Path.GetFullPath(System.IO.Path.Combine(root, match.Path)))
                .Distinct(StringComparer.Ordinal)
                .Order(StringComparer.Ordinal)
                .ToArray();
        }
        if (files.Length == 0)
            throw new GateInputException(ErrorCodes.SampleNotFound,
                $"no sample file matches '{pattern}' (relative to '{baseFull}')");
        return files;
    }

    /// <summary>'**/' any folders (or none), '**' anything, '*' anything within a name, '?' one character of a name.</summary>
    private static Regex GlobRegex(string glob)
    {
        var pattern = new StringBuilder("^");
        for (var i = 0; i < glob.Length; i++)
        {
            if (glob[i] == '*' && i + 1 < glob.Length && glob[i + 1] == '*')
            {
                var slash = i + 2 < glob.Length && glob[i + 2] == '/';
                pattern.Append(slash ? "(?:.*/)?" : ".*");
                i += slash ? 2 : 1;
            }
            else if (glob[i] == '*') pattern.Append("[^/]*");
            else if (glob[i] == '?') pattern.Append("[^/]");
            else pattern.Append(Regex.Escape(glob[i].ToString()));
        }
        var options = RegexOptions.CultureInvariant | (OperatingSystem.IsWindows() ? RegexOptions.IgnoreCase : 0);
        return new Regex(pattern.Append('$').ToString(), options);
    }

    private static readonly char[] Separators = OperatingSystem.IsWindows() ? ['/', '\\'] : ['/'];
}
