using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.IO;

/// <summary>
/// Refuses, before it is opened, an input that is not a regular file: opening a named pipe waits for a writer that may
/// never come, and a device such as <c>/dev/zero</c> never ends. Missing files and folders pass: the readers report
/// those with their own codes (a folder is a valid sample).
/// </summary>
internal static class InputFileGuard
{
    /// <summary>A contract larger than this is refused unread: real contracts are a few kilobytes.</summary>
    public const long ContractSizeLimit = 1 << 20;

    /// <summary>GATE0006 when <paramref name="input"/> is a named pipe, a device, a socket or another special file.</summary>
    public static void VerifyRegular(RunFile input)
    {
        var node = FileNode.Of(input.Path);
        if (node.Kind is FileNodeKind.Missing or FileNodeKind.Regular or FileNodeKind.Directory) return;
        var full = Path.GetFullPath(input.Path);
        throw new GateInputException(ErrorCodes.InputNotRegular,
            $"{input.Role} '{full}' is {FileNode.Describe(node.Kind)}, not a regular file; GateTasks reads only regular files " +
            "(a pipe may never deliver an end, a device may never end).",
            new SourceLocation(full));
    }

    /// <summary><see cref="VerifyRegular"/> for each input.</summary>
    public static void VerifyAll(IEnumerable<RunFile> inputs)
    {
        foreach (var input in inputs) VerifyRegular(input);
    }

    /// <summary>
    /// GATE0001 for an empty path, GATE0006 for a contract that is not a regular file, GATE0007 for one above
    /// <see cref="ContractSizeLimit"/>.
    /// </summary>
    public static void VerifyContract(string path)
    {
        if (string.IsNullOrWhiteSpace(path))
            throw new GateInputException(ErrorCodes.Usage, "No contract given: its path is empty (an unset variable?).");
        VerifyRegular(new RunFile(path, "the contract"));
        var info = new FileInfo(path);
        if (info.Exists && info.Length > ContractSizeLimit)
            throw new GateInputException(ErrorCodes.ContractTooLarge,
                $"The contract '{Path.GetFullPath(path)}' holds {InvariantNumber.Count(info.Length)} bytes; a contract may hold at most " +
                $"{InvariantNumber.Count(ContractSizeLimit)} bytes (1 MB). Is this the right file?",
                new SourceLocation(Path.GetFullPath(path)));
    }
}
