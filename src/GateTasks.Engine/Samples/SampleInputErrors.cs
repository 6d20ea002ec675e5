using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>The "cannot read this file" errors shared by the sample readers.</summary>
internal static class SampleInputErrors
{
    /// <summary>
    /// Whether <paramref name="exception"/> is a failure of the file or of the library decoding it, to be reported
    /// as unreadable input. A corrupt file can make a decoder throw almost anything (index, overflow, format,
    /// end-of-stream, or out-of-memory when a damaged size field asks for gigabytes), so only our own diagnostics
    /// and cancellation pass through unwrapped.
    /// </summary>
    public static bool IsReadFailure(Exception exception) =>
        exception is not GateInputException and not OperationCanceledException;

    /// <summary>GATE2002 for <paramref name="path"/>, saying what went wrong in one line.</summary>
    public static GateInputException Unreadable(string path, string what, Exception? inner = null, int line = 0) =>
        new(ErrorCodes.SampleUnreadable, $"sample file '{path}' cannot be read: {what}",
            new SourceLocation(path, line), inner);

    /// <summary>One line describing <paramref name="exception"/> for a message (no stack trace, no type names).</summary>
    public static string Describe(Exception exception)
    {
        var message = exception.Message.ReplaceLineEndings(" ").Trim();
        return message.Length == 0 ? exception.GetType().Name : message;
    }

    /// <summary>GATE2001 when a sample file is missing, or GATE2002 when the system refuses to open it.</summary>
    public static GateInputException OpenFailure(string path, Exception exception) =>
        exception is FileNotFoundException or DirectoryNotFoundException
            ? new GateInputException(ErrorCodes.SampleNotFound, $"sample file '{path}' does not exist",
                new SourceLocation(path), exception)
            : Unreadable(path, Describe(exception), exception);

    /// <summary>Opens <paramref name="path"/> for reading, turning system errors into diagnostics.</summary>
    public static FileStream OpenRead(string path, FileOptions options)
    {
        try
        {
            return new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16, options);
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException or NotSupportedException
                                       or ArgumentException)
        {
            throw OpenFailure(path, ex);
        }
    }
}
