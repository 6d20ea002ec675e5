using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.IO;

/// <summary>
/// Writes a file through a temporary sibling and renames it into place, so readers (and a build that was
/// killed half-way) never see a half-written report or reference. Only a regular file or a new path is replaced: a
/// rename over a device, a named pipe or a socket would replace it with a regular file (as root, <c>/dev/null</c>
/// itself), so those are refused (GATE0005) before anything is written. A symbolic link is written through: its
/// target is replaced, the link stays.
/// </summary>
internal static class AtomicFile
{
    /// <summary>Writes via <paramref name="write"/> into a temporary file, then replaces <paramref name="path"/>.</summary>
    public static void Write(string path, Action<Stream> write)
    {
        OutputPathGuard.VerifyKind(new RunFile(path, "the output"));
        var full = LinkFreePath.Of(path);
        var temp = full + "." + Guid.NewGuid().ToString("N")[..8] + ".tmp";
        try
        {
            Directory.CreateDirectory(Path.GetDirectoryName(full)!);
            using (var stream = new FileStream(temp, FileMode.CreateNew, FileAccess.Write, FileShare.None))
            {
                write(stream);
                stream.Flush(flushToDisk: true);
            }
            File.Move(temp, full, overwrite: true);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            TryDelete(temp);
            throw new GateInputException(ErrorCodes.OutputNotWritable, $"Cannot write {full}: {e.Message}", new SourceLocation(full));
        }
        catch
        {
            TryDelete(temp);
            throw;
        }
    }

    /// <summary>Writes text (UTF-8, no byte-order mark) atomically.</summary>
    public static void WriteText(string path, string text) =>
        Write(path, s =>
        {
            using var w = new StreamWriter(s, new System.Text.UTF8Encoding(false), leaveOpen: true);
            w.Write(text);
        });

    private static void TryDelete(string path)
    {
        try { File.Delete(path); } catch (IOException) { } catch (UnauthorizedAccessException) { }
    }
}
