using System;
using System.Collections.Generic;
using System.IO;
using System.IO.Hashing;
using System.Linq;
using System.Text;

namespace GateTasks.MSBuild;

/// <summary>
/// A content digest (XXH128) of files and text, for deciding whether a check is up to date. Contents, not
/// modification times: a file copied in with an old time (<c>cp -p</c>, <c>rsync -a</c>, an unpacked archive) still
/// changes the digest.
/// </summary>
/// <remarks>
/// Computed here, in the build's own process, rather than by the engine: a no-op build then starts no process (the
/// engine's start-up costs more than reading the inputs), and XXH3 reads faster than the disk delivers. Each path is
/// hashed with its content, so a file renamed or moved changes the digest too.
/// </remarks>
internal sealed class InputsDigest
{
    private const int BufferSize = 1 << 20;
    private readonly XxHash128 _hash = new();
    private readonly byte[] _buffer = new byte[BufferSize];

    /// <summary>Adds a piece of text (a setting, a name), delimited so that two pieces never read as one.</summary>
    public InputsDigest Add(string text)
    {
        var bytes = Encoding.UTF8.GetBytes(text);
        _hash.Append(BitConverter.GetBytes(bytes.Length));
        _hash.Append(bytes);
        return this;
    }

    /// <summary>
    /// Adds a path and what is there: a file's content, a folder's sorted entry names, or a mark for nothing (so a
    /// file that appears changes the digest).
    /// </summary>
    public InputsDigest AddPath(string path)
    {
        Add(path);
        if (File.Exists(path))
        {
            Add("file");
            using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.ReadWrite | FileShare.Delete, BufferSize, FileOptions.SequentialScan);
            long length = 0;
            int read;
            while ((read = stream.Read(_buffer, 0, _buffer.Length)) > 0)
            {
                _hash.Append(new ReadOnlySpan<byte>(_buffer, 0, read));
                length += read;
            }
            _hash.Append(BitConverter.GetBytes(length));
        }
        else if (Directory.Exists(path))
        {
            Add("folder");
            foreach (var entry in Directory.EnumerateFileSystemEntries(path).Select(Path.GetFileName).OrderBy(n => n, StringComparer.Ordinal))
                Add(entry!);
        }
        else Add("absent");
        return this;
    }

    /// <summary>The digest so far, as 32 hexadecimal digits.</summary>
    public string Hex()
    {
        var bytes = _hash.GetCurrentHash();
        var sb = new StringBuilder(bytes.Length * 2);
        foreach (var b in bytes) sb.Append(b.ToString("x2", System.Globalization.CultureInfo.InvariantCulture));
        return sb.ToString();
    }

    /// <summary>The digest of one path (see <see cref="AddPath"/>).</summary>
    public static string Of(string path) => new InputsDigest().AddPath(path).Hex();

    /// <summary>The digest of every file under <paramref name="folder"/> (the engine's build), in a stable order.</summary>
    public InputsDigest AddFolderFiles(string folder)
    {
        if (!Directory.Exists(folder)) return Add("absent " + folder);
        foreach (var file in Directory.EnumerateFiles(folder, "*", SearchOption.AllDirectories).OrderBy(f => f, StringComparer.Ordinal))
            AddPath(file);
        return this;
    }

    /// <summary>Adds every path in order.</summary>
    public InputsDigest AddPaths(IEnumerable<string> paths)
    {
        foreach (var path in paths) AddPath(path);
        return this;
    }
}
