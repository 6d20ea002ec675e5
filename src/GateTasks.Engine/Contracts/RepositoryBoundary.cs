using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;

namespace GateTasks.Engine.Contracts;

/// <summary>
/// Keeps a contract's reference and acceptance ledger inside the Git work tree that holds the contract. A file
/// outside is not reviewed with the contract, so an edit that pointed there could swap the accepted state for an
/// unreviewed one. Symbolic links are followed before the comparison. Samples are exempt: they are the thing under
/// test, are never trusted, and usually live on scratch storage. A contract outside any work tree has no boundary.
/// </summary>
internal static class RepositoryBoundary
{
    private static readonly StringComparison PathComparison =
        OperatingSystem.IsWindows() || OperatingSystem.IsMacOS() ? StringComparison.OrdinalIgnoreCase : StringComparison.Ordinal;

    /// <summary>Refuses a reference or ledger path that resolves outside the contract's work tree.</summary>
    public static void Verify(PrecisionContract contract)
    {
        var root = FindRoot(contract.Directory);
        if (root is null) return;
        Refuse(contract.ReferenceFullPath, "reference", root, contract.ReferenceLocation);
        Refuse(contract.LedgerFullPath, "acceptance ledger", root,
            contract.Guard.LedgerLocation ?? contract.Guard.Location ?? new SourceLocation(contract.FilePath, 1, 1));
    }

    /// <summary>The nearest folder at or above <paramref name="directory"/> (links resolved) that holds <c>.git</c>, or null.</summary>
    public static string? FindRoot(string directory)
    {
        for (var d = new DirectoryInfo(Resolve(Path.GetFullPath(directory))); d is not null; d = d.Parent)
            // A folder in a plain clone, a file in a worktree or submodule.
            if (Directory.Exists(Path.Combine(d.FullName, ".git")) || File.Exists(Path.Combine(d.FullName, ".git")))
                return d.FullName;
        return null;
    }

    private static void Refuse(string path, string what, string root, SourceLocation location)
    {
        var resolved = Resolve(path);
        if (Inside(resolved, root)) return;
        var shown = string.Equals(resolved, path, PathComparison) ? path : $"{path} (which resolves to {resolved})";
        throw new GateInputException(ErrorCodes.ContractPathOutsideRepository,
            $"The {what} {shown} lies outside the repository {root} that holds the contract; it would not be reviewed with the contract. Keep it in the repository.",
            location);
    }

    private static bool Inside(string path, string root)
    {
        var prefix = Path.EndsInDirectorySeparator(root) ? root : root + Path.DirectorySeparatorChar;
        return path.StartsWith(prefix, PathComparison) || string.Equals(path, root, PathComparison);
    }

    /// <summary>The path with every symbolic link along it followed (<see cref="LinkFreePath"/>).</summary>
    public static string Resolve(string fullPath) => LinkFreePath.Of(fullPath);
}
