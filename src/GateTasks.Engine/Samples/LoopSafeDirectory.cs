using Microsoft.Extensions.FileSystemGlobbing.Abstractions;

namespace GateTasks.Engine.Samples;

/// <summary>
/// A folder as the globbing library walks it, following symbolic links (sample folders are often links to bulk
/// storage) but entering each real folder once: a link back up the tree (a loop) is passed over instead of being
/// walked for ever, and no folder's files are matched twice.
/// </summary>
internal sealed class LoopSafeDirectory : DirectoryInfoBase
{
    private readonly DirectoryInfo _directory;
    private readonly string _realPath;
    private readonly HashSet<string> _entered;
    private readonly LoopSafeDirectory? _parent;

    /// <summary>The root of a walk.</summary>
    public LoopSafeDirectory(DirectoryInfo root)
        : this(root, RealPathOf(root, null), new HashSet<string>(StringComparer.Ordinal), null)
    {
        _entered.Add(_realPath);
    }

    private LoopSafeDirectory(DirectoryInfo directory, string realPath, HashSet<string> entered, LoopSafeDirectory? parent)
    {
        _directory = directory;
        _realPath = realPath;
        _entered = entered;
        _parent = parent;
    }

    public override string Name => _directory.Name;

    public override string FullName => _directory.FullName;

    public override DirectoryInfoBase? ParentDirectory =>
        _parent ?? (_directory.Parent is { } p ? new LoopSafeDirectory(p) : null);

    public override IEnumerable<FileSystemInfoBase> EnumerateFileSystemInfos()
    {
        FileSystemInfo[] entries;
        try
        {
            entries = _directory.GetFileSystemInfos("*", new EnumerationOptions { IgnoreInaccessible = true, AttributesToSkip = 0 });
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            yield break;
        }
        foreach (var entry in entries)
        {
            if (entry is FileInfo file) yield return new FileInfoWrapper(file);
            else if (entry is DirectoryInfo folder && RealPathOf(folder, this) is { } real && _entered.Add(real))
                yield return new LoopSafeDirectory(folder, real, _entered, this);
        }
    }

    public override DirectoryInfoBase? GetDirectory(string path)
    {
        if (path == "..") return ParentDirectory;
        var folder = new DirectoryInfo(Path.Combine(_directory.FullName, path));
        return new LoopSafeDirectory(folder, RealPathOf(folder, this), _entered, this);
    }

    public override FileInfoBase? GetFile(string path) => new FileInfoWrapper(new FileInfo(Path.Combine(_directory.FullName, path)));

    // Where a folder really is: a link's target resolved against the parent's real path (a relative target such
    // as "." or ".." means a place relative to where the link really lies), else the parent's real path plus the name.
    private static string RealPathOf(DirectoryInfo folder, LoopSafeDirectory? parent)
    {
        if (parent is null) return RealPathOfRoot(folder.FullName);
        try
        {
            if (folder.LinkTarget is { } target) return RealPathOfRoot(Path.Combine(parent._realPath, target));
        }
        catch (IOException)
        {
            // Unreadable link: treat it as its own place.
        }
        return Path.Combine(parent._realPath, folder.Name);
    }

    // The root's real path, component by component, so a root reached through a link compares equal to that link's
    // target met again inside the walk.
    private static string RealPathOfRoot(string path)
    {
        var full = Path.GetFullPath(path);
        var root = Path.GetPathRoot(full) ?? "";
        var real = root;
        foreach (var part in full[root.Length..].Split(Path.DirectorySeparatorChar, StringSplitOptions.RemoveEmptyEntries))
        {
            var next = Path.Combine(real, part);
            try
            {
                var info = new DirectoryInfo(next);
                if (info.LinkTarget is not null && info.ResolveLinkTarget(returnFinalTarget: true) is { } target)
                    next = Path.GetFullPath(target.FullName);
            }
            catch (IOException)
            {
                // Left as written: the walk below still stops at the first folder it meets twice.
            }
            real = next;
        }
        return Path.TrimEndingDirectorySeparator(real);
    }
}
