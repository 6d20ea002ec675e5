using System.Diagnostics;
using GateTasks.Engine.IO;

namespace GateTasks.Engine.Tests.FileSystem;

/// <summary>
/// The kind and identity of a file as FileNode reads them from the runtime's native stat, compared with what the
/// system's own tools say: GNU coreutils' mkfifo and ln make the entries, and `stat -c '%d %i'` gives the device and
/// inode (coreutils 9.1, Debian bookworm).
/// </summary>
public sealed class FileNodeTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-filenode-").FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private static string Tool(string file, params string[] args)
    {
        var psi = new ProcessStartInfo(file, args) { RedirectStandardOutput = true, RedirectStandardError = true };
        using var p = Process.Start(psi)!;
        var output = p.StandardOutput.ReadToEnd().Trim();
        p.WaitForExit();
        Assert.True(p.ExitCode == 0, $"{file} {string.Join(' ', args)}: exit {p.ExitCode}");
        return output;
    }

    [Fact]
    public void Kinds_are_told_apart_and_links_followed()
    {
        if (!OperatingSystem.IsLinux()) return; // the tools below are GNU's
        var file = Path.Combine(_dir, "file");
        File.WriteAllText(file, "x");
        Tool("mkfifo", Path.Combine(_dir, "pipe"));
        File.CreateSymbolicLink(Path.Combine(_dir, "link"), file);
        File.CreateSymbolicLink(Path.Combine(_dir, "dangling"), Path.Combine(_dir, "nothing"));

        Assert.Equal(FileNodeKind.Regular, FileNode.Of(file).Kind);
        Assert.Equal(FileNodeKind.Directory, FileNode.Of(_dir).Kind);
        Assert.Equal(FileNodeKind.Fifo, FileNode.Of(Path.Combine(_dir, "pipe")).Kind);
        Assert.Equal(FileNodeKind.Regular, FileNode.Of(Path.Combine(_dir, "link")).Kind);
        Assert.Equal(FileNodeKind.Missing, FileNode.Of(Path.Combine(_dir, "dangling")).Kind);
        Assert.Equal(FileNodeKind.Missing, FileNode.Of(Path.Combine(_dir, "nothing")).Kind);
        if (File.Exists("/dev/null")) Assert.Equal(FileNodeKind.CharacterDevice, FileNode.Of("/dev/null").Kind); // only looked at
    }

    [Fact]
    public void Device_and_inode_are_those_stat_reports_so_a_hard_link_is_the_same_file()
    {
        if (!OperatingSystem.IsLinux()) return;
        var a = Path.Combine(_dir, "a");
        var b = Path.Combine(_dir, "b");
        File.WriteAllText(a, "one");
        File.WriteAllText(b, "two");
        Tool("ln", a, Path.Combine(_dir, "a-hard"));

        var node = FileNode.Of(a);
        var stat = Tool("stat", "-c", "%d %i", a).Split(' ');
        Assert.Equal((long.Parse(stat[0]), long.Parse(stat[1])), (node.Device, node.Inode));
        Assert.True(FileNode.SameFile(node, FileNode.Of(Path.Combine(_dir, "a-hard"))));
        Assert.False(FileNode.SameFile(node, FileNode.Of(b)));
    }
}
