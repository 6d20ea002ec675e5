using System.Security.Cryptography;

namespace GateTasks.Engine.IO;

/// <summary>SHA-256 of a file's bytes, lower-case hex; streams the file.</summary>
internal static class FileDigest
{
    public static string Sha256(string path)
    {
        using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 20);
        return Convert.ToHexString(SHA256.HashData(stream)).ToLowerInvariant();
    }
}
