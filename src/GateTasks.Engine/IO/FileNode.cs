using System.Runtime.InteropServices;

namespace GateTasks.Engine.IO;

/// <summary>What kind of file system entry a path names.</summary>
internal enum FileNodeKind
{
    /// <summary>Nothing at the path (or a symbolic link to nothing).</summary>
    Missing,
    /// <summary>A regular file: the only kind GateTasks reads or replaces.</summary>
    Regular,
    /// <summary>A folder.</summary>
    Directory,
    /// <summary>A named pipe: opening it waits for a writer, reading it may never end.</summary>
    Fifo,
    /// <summary>A character device such as <c>/dev/null</c> or <c>/dev/zero</c>.</summary>
    CharacterDevice,
    /// <summary>A block device (a disk).</summary>
    BlockDevice,
    /// <summary>A Unix domain socket.</summary>
    Socket,
    /// <summary>Something else the system reports.</summary>
    Other,
}

/// <summary>
/// The kind of entry a path names, symbolic links followed, and its identity (device and inode), so that two names of
/// one file — a hard link, a case-insensitive spelling — are seen as one. .NET's file APIs call a named pipe or a device
/// a plain file, and opening a named pipe blocks, so on Unix the answer comes from the <c>stat</c> call of the
/// runtime's own native layer (<c>libSystem.Native</c>, which ships with every .NET runtime and normalises the file
/// type bits across Unix systems).
/// </summary>
internal readonly record struct FileNode(FileNodeKind Kind, long Device, long Inode)
{
    /// <summary>Whether the device and inode are known (Unix, an existing entry).</summary>
    public bool HasIdentity => Kind != FileNodeKind.Missing && (Device != 0 || Inode != 0);

    /// <summary>The entry <paramref name="path"/> names, symbolic links followed.</summary>
    public static FileNode Of(string path)
    {
        if (!OperatingSystem.IsWindows())
        {
            try
            {
                if (NativeStat.Stat(path, out var status) != 0) return new FileNode(FileNodeKind.Missing, 0, 0);
                return new FileNode(KindOf(status.Mode), status.Dev, status.Ino);
            }
            catch (Exception e) when (e is DllNotFoundException or EntryPointNotFoundException)
            {
                // A runtime without the call: fall back to what .NET can tell (no pipes or devices told apart).
            }
        }
        if (Directory.Exists(path)) return new FileNode(FileNodeKind.Directory, 0, 0);
        if (!File.Exists(path)) return new FileNode(FileNodeKind.Missing, 0, 0);
        // Windows device names (NUL, CON, \\.\…) are not files on a disk.
        var full = Path.GetFullPath(path);
        return full.StartsWith(@"\\.\", StringComparison.Ordinal) || full.StartsWith(@"\\?\GLOBALROOT", StringComparison.OrdinalIgnoreCase)
            ? new FileNode(FileNodeKind.CharacterDevice, 0, 0)
            : new FileNode(FileNodeKind.Regular, 0, 0);
    }

    /// <summary>Whether <paramref name="a"/> and <paramref name="b"/> are one existing file (same device and inode).</summary>
    public static bool SameFile(FileNode a, FileNode b) =>
        a.HasIdentity && b.HasIdentity && a.Device == b.Device && a.Inode == b.Inode;

    /// <summary>The kind in words, for messages: "a named pipe (FIFO)", "a character device" ….</summary>
    public static string Describe(FileNodeKind kind) => kind switch
    {
        FileNodeKind.Missing => "missing",
        FileNodeKind.Regular => "a regular file",
        FileNodeKind.Directory => "a directory",
        FileNodeKind.Fifo => "a named pipe (FIFO)",
        FileNodeKind.CharacterDevice => "a character device",
        FileNodeKind.BlockDevice => "a block device",
        FileNodeKind.Socket => "a socket",
        _ => "not a regular file",
    };

    // The file type bits as libSystem.Native reports them (the same on every Unix).
    private static FileNodeKind KindOf(int mode) => (mode & 0xF000) switch
    {
        0x8000 => FileNodeKind.Regular,
        0x4000 => FileNodeKind.Directory,
        0x1000 => FileNodeKind.Fifo,
        0x2000 => FileNodeKind.CharacterDevice,
        0x6000 => FileNodeKind.BlockDevice,
        0xC000 => FileNodeKind.Socket,
        _ => FileNodeKind.Other,
    };

    private static class NativeStat
    {
        // The layout of libSystem.Native's FileStatus since .NET 7 (the engine runs on .NET 8 or later).
        [StructLayout(LayoutKind.Sequential)]
        internal struct Status
        {
            public int Flags;
            public int Mode;
            public uint Uid;
            public uint Gid;
            public long Size;
            public long ATime;
            public long ATimeNsec;
            public long MTime;
            public long MTimeNsec;
            public long CTime;
            public long CTimeNsec;
            public long BirthTime;
            public long BirthTimeNsec;
            public long Dev;
            public long RDev;
            public long Ino;
            public uint UserFlags;
        }

        [DllImport("libSystem.Native", EntryPoint = "SystemNative_Stat", CharSet = CharSet.Ansi, BestFitMapping = false, ThrowOnUnmappableChar = true)]
        internal static extern int Stat([MarshalAs(UnmanagedType.LPUTF8Str)] string path, out Status status);
    }
}
