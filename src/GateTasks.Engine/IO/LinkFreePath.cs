namespace GateTasks.Engine.IO;

/// <summary>
/// A full path with every symbolic link along it followed, so that two spellings of one file compare equal and a
/// link cannot hide where a path leads.
/// </summary>
internal static class LinkFreePath
{
    // More link hops than this in one path is a loop (the limit Linux itself uses).
    private const int MaxLinkHops = 40;

    /// <summary>Whether paths differing only in letter case name one file here (Windows, macOS).</summary>
    public static readonly StringComparison Comparison =
        OperatingSystem.IsWindows() || OperatingSystem.IsMacOS() ? StringComparison.OrdinalIgnoreCase : StringComparison.Ordinal;

    /// <summary>
    /// <paramref name="path"/> made absolute, with every symbolic link along it followed (parts that do not exist are
    /// kept as written). A loop resolves to the path as far as it got, which then lies wherever the loop points.
    /// </summary>
    public static string Of(string path)
    {
        var fullPath = Path.GetFullPath(path);
        var pending = new Stack<string>();
        var rootPart = Path.GetPathRoot(fullPath) ?? "/";
        Push(pending, fullPath[rootPart.Length..]);
        var current = rootPart;
        var hops = 0;
        while (pending.TryPop(out var part))
        {
            if (part == ".") continue;
            if (part == "..") { current = Path.GetDirectoryName(current) ?? current; continue; }
            var next = Path.Combine(current, part);
            string? target = null;
            try { target = new FileInfo(next).LinkTarget; }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException) { }
            if (target is null || ++hops > MaxLinkHops)
            {
                current = next;
                continue;
            }
            // The link's target replaces it: an absolute target restarts from its root, a relative one from here.
            if (Path.IsPathRooted(target))
            {
                current = Path.GetPathRoot(target) ?? rootPart;
                target = target[current.Length..];
            }
            Push(pending, target);
        }
        return current;
    }

    private static void Push(Stack<string> pending, string relative)
    {
        var parts = relative.Split(Path.DirectorySeparatorChar, Path.AltDirectorySeparatorChar);
        for (var i = parts.Length - 1; i >= 0; i--)
            if (parts[i].Length > 0) pending.Push(parts[i]);
    }
}
