using System;
using System.Collections.Generic;
using System.Globalization;
using System.IO;
using System.Linq;
using System.Text;

namespace GateTasks.MSBuild;

/// <summary>
/// The list of a contract's inputs from the last time the engine was asked, kept in the build's intermediate folder
/// with what it depended on: the engine's and the contract's content digests, the settings, and the state of every
/// file and folder the engine named as deciding the list (a file's presence, a folder's sorted entry names, or
/// absence). While none of these changed, a no-op build reuses the list instead of starting the engine. No
/// modification time counts: a contract or a shard copied in with an old time (<c>cp -p</c>) still changes the key.
/// </summary>
internal static class InputsCache
{
    private const string Header = "gatetasks-inputs 2";

    /// <summary>The cache file for <paramref name="contract"/> in <paramref name="folder"/>.</summary>
    public static string FileFor(string folder, string contract) =>
        Path.Combine(folder, "inputs-" + StableHash(contract) + ".txt");

    /// <summary>What the list depends on besides the named paths: the engine build, the contract, and the settings.</summary>
    public static string Key(string engine, string contract, string? sample, string? workingDirectory) =>
        string.Join("|", engine, InputsDigest.Of(engine), contract, InputsDigest.Of(contract), sample ?? "", workingDirectory ?? "");

    /// <summary>The cached inputs, or null when there are none or anything they depend on changed.</summary>
    public static IReadOnlyList<string>? TryRead(string file, string key)
    {
        string[] lines;
        try
        {
            if (!File.Exists(file)) return null;
            lines = File.ReadAllLines(file);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return null;
        }
        if (lines.Length < 2 || lines[0] != Header || lines[1] != "key " + key) return null;
        var inputs = new List<string>();
        foreach (var line in lines.Skip(2))
        {
            if (line.StartsWith("input ", StringComparison.Ordinal)) inputs.Add(line.Substring(6));
            else if (line.StartsWith("depends ", StringComparison.Ordinal))
            {
                var space = line.IndexOf(' ', 8);
                if (space < 0 || line.Substring(8, space - 8) != State(line.Substring(space + 1))) return null;
            }
            else return null;
        }
        return inputs;
    }

    /// <summary>Writes the list (to a temporary file, then into place, so a reader never sees half of it).</summary>
    public static void Write(string file, string key, IEnumerable<string> inputs, IEnumerable<string> dependencies)
    {
        var text = new StringBuilder().Append(Header).Append('\n').Append("key ").Append(key).Append('\n');
        foreach (var path in dependencies) text.Append("depends ").Append(State(path)).Append(' ').Append(path).Append('\n');
        foreach (var input in inputs) text.Append("input ").Append(input).Append('\n');
        try
        {
            Directory.CreateDirectory(Path.GetDirectoryName(file)!);
            var temporary = file + "." + Guid.NewGuid().ToString("N") + ".tmp";
            File.WriteAllText(temporary, text.ToString());
            if (File.Exists(file)) File.Replace(temporary, file, null);
            else File.Move(temporary, file);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // Only a cache: the next build asks the engine again.
        }
    }

    // What of a path can change the list: "f" for a file (its content does not change which files are read), a
    // digest of the sorted entry names for a folder (a glob's matches), "-" for nothing there. No spaces: the line
    // is "depends STATE PATH".
    private static string State(string path) =>
        File.Exists(path) ? "f"
        : Directory.Exists(path) ? "d" + new InputsDigest().AddPath(path).Hex()
        : "-";

    // FNV-1a over the path's UTF-16 units: stable across processes, unlike string.GetHashCode.
    private static string StableHash(string text)
    {
        ulong hash = 14695981039346656037;
        foreach (var c in text)
        {
            hash ^= c;
            hash *= 1099511628211;
        }
        return hash.ToString("x16", CultureInfo.InvariantCulture);
    }
}
