using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.IO;

/// <summary>
/// Refuses, before anything is written, an output that would destroy something: one that names an input of the same
/// run (symbolic links followed, hard links and case-insensitive spellings seen through), two outputs that name one
/// file, and an output that is not a regular file or a new path (a device, a named pipe, a socket, a folder).
/// </summary>
internal static class OutputPathGuard
{
    /// <summary>GATE0005 unless <paramref name="output"/> is a regular file, a new path, or a link to either.</summary>
    public static void VerifyKind(RunFile output)
    {
        var node = FileNode.Of(output.Path);
        if (node.Kind is FileNodeKind.Missing or FileNodeKind.Regular) return;
        var full = Path.GetFullPath(output.Path);
        throw new GateInputException(ErrorCodes.OutputNotRegular,
            $"{output.Role} '{full}' is {FileNode.Describe(node.Kind)}, not a regular file; outputs are written only to regular files or new paths, " +
            "never over a device, a named pipe, a socket or a folder. Choose a file path.",
            new SourceLocation(full));
    }

    /// <summary>
    /// GATE0005 for an output that is not a regular file or a new path; GATE0004 for one that names an input of the run
    /// or the same file as another output. Reads nothing but the file system's entries.
    /// </summary>
    public static void Verify(IReadOnlyList<RunFile> outputs, IEnumerable<RunFile> inputs)
    {
        foreach (var output in outputs) VerifyKind(output);
        var resolvedInputs = inputs.Select(Resolve).ToList();
        var resolvedOutputs = outputs.Select(Resolve).ToList();
        for (var i = 0; i < resolvedOutputs.Count; i++)
        {
            var output = resolvedOutputs[i];
            foreach (var input in resolvedInputs.Where(input => Same(output, input)))
                throw new GateInputException(ErrorCodes.OutputIsInput,
                    $"{output.File.Role} '{output.Full}' is {input.File.Role} of this run{Through(output, input)}; writing it would destroy it. " +
                    "It was left as it was; choose another output path.",
                    new SourceLocation(output.Full));
            for (var j = 0; j < i; j++)
                if (Same(output, resolvedOutputs[j]))
                    throw new GateInputException(ErrorCodes.OutputIsInput,
                        $"{resolvedOutputs[j].File.Role} and {output.File.Role} name the same file '{output.Full}'{Through(output, resolvedOutputs[j])}; " +
                        "one would overwrite the other; give each output a path of its own.",
                        new SourceLocation(output.Full));
        }
    }

    private sealed record Resolved(RunFile File, string Full, string LinkFree, FileNode Node);

    private static Resolved Resolve(RunFile file)
    {
        var full = Path.GetFullPath(file.Path);
        return new Resolved(file, full, LinkFreePath.Of(full), FileNode.Of(full));
    }

    private static bool Same(Resolved a, Resolved b) =>
        string.Equals(a.LinkFree, b.LinkFree, LinkFreePath.Comparison) || FileNode.SameFile(a.Node, b.Node);

    private static string Through(Resolved output, Resolved other) =>
        string.Equals(output.Full, other.Full, StringComparison.Ordinal) ? ""
        : string.Equals(output.LinkFree, other.LinkFree, LinkFreePath.Comparison) ? $" ('{other.Full}', links followed: both are '{output.LinkFree}')"
        : $" ('{other.Full}': the same file under another name, a hard link)";
}
