using System.IO.Hashing;
using GateTasks.Engine.Diagnostics;

namespace GateTasks.Engine.Samples;

/// <summary>
/// Content digests of a sample's files, so that the same shard is never counted twice under another name. XXH128
/// (System.IO.Hashing) is a fast non-cryptographic digest: enough to tell copies apart from different files, not a
/// guard against someone crafting a collision.
/// </summary>
internal static class ShardContent
{
    /// <summary>XXH128 of a file's bytes, lower-case hex; streams the file (memory does not grow with its size).</summary>
    public static string Digest(string path)
    {
        var hash = new XxHash128();
        using (var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 20, FileOptions.SequentialScan))
            hash.Append(stream);
        return Convert.ToHexString(hash.GetCurrentHash()).ToLowerInvariant();
    }

    /// <summary>
    /// Each file with its digest, in the given order; GATE2204 when two files have the same content (named both),
    /// GATE2002 when one cannot be read.
    /// </summary>
    public static IReadOnlyList<ShardFile> Identify(IReadOnlyList<string> files)
    {
        var shards = new List<ShardFile>(files.Count);
        var first = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var file in files)
        {
            string digest;
            try
            {
                digest = Digest(file);
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                throw new GateInputException(ErrorCodes.SampleUnreadable, $"sample file '{file}' cannot be read: {e.Message}", new SourceLocation(file));
            }
            if (!first.TryAdd(digest, file))
                throw new GateInputException(ErrorCodes.SampleDuplicateContent,
                    $"sample files '{first[digest]}' and '{file}' have the same content (XXH128 {digest}): the same shard would be counted twice; " +
                    "remove the copy or narrow the sample pattern",
                    new SourceLocation(file));
            shards.Add(new ShardFile(file, digest));
        }
        return shards;
    }
}
