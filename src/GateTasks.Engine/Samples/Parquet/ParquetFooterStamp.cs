using System.Buffers.Binary;
using System.IO.Hashing;
using Microsoft.Win32.SafeHandles;

namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// Which footer a Parquet file had when it was opened: the file's length, its footer's length and a digest (XXH3)
/// of the footer's bytes.
/// The metadata parsed when a sample is opened is used again to read it, so before reading, the file must still end
/// in that footer; a file replaced in between would otherwise be read where the old file kept its column chunks.
/// </summary>
internal readonly record struct ParquetFooterStamp(long FileLength, int FooterLength, ulong FooterDigest)
{
    /// <summary>The stamp of the file behind <paramref name="file"/>; lengths and digest 0 where it has no readable footer.</summary>
    public static ParquetFooterStamp Read(SafeFileHandle file)
    {
        var length = RandomAccess.GetLength(file);
        Span<byte> tail = stackalloc byte[8];
        if (length < 12 || !TryRead(file, tail, length - 8)) return new(length, 0, 0);
        var footerLength = BinaryPrimitives.ReadInt32LittleEndian(tail);
        if (footerLength <= 0 || footerLength > length - 12) return new(length, 0, 0);
        var footer = new byte[footerLength];
        return TryRead(file, footer, length - 8 - footerLength) ? new(length, footerLength, XxHash3.HashToUInt64(footer)) : new(length, 0, 0);
    }

    private static bool TryRead(SafeFileHandle file, Span<byte> buffer, long offset)
    {
        for (var read = 0; read < buffer.Length;)
        {
            var n = RandomAccess.Read(file, buffer[read..], offset + read);
            if (n == 0) return false;
            read += n;
        }
        return true;
    }
}
