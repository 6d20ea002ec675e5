using System.Buffers.Binary;

namespace GateTasks.Engine.Samples.Hdf5;

/// <summary>
/// The start of an HDF5 file (HDF5 File Format Specification, section II.A, "Disk Format: Level 0A — Format
/// Signature and Superblock"): the signature, at byte 0 or at 512, 1024, 2048 … after a user block, and the
/// superblock's end-of-file address, which says how long the file was when it was written. A file shorter than that
/// lost its end.
/// </summary>
internal static class Hdf5Superblock
{
    /// <summary>The eight bytes that open the superblock.</summary>
    public static ReadOnlySpan<byte> Signature => [0x89, (byte)'H', (byte)'D', (byte)'F', (byte)'\r', (byte)'\n', 0x1A, (byte)'\n'];

    /// <summary>
    /// Where the signature is in <paramref name="stream"/> (null: nowhere it may be), and the length the superblock
    /// records for the file (null when the superblock is of a version not known here or states no end).
    /// </summary>
    public static (long? Offset, long? RecordedLength) Read(Stream stream)
    {
        Span<byte> block = stackalloc byte[48];
        for (long at = 0; at + Signature.Length <= stream.Length; at = at == 0 ? 512 : at * 2)
        {
            stream.Position = at;
            var got = stream.ReadAtLeast(block, block.Length, throwOnEndOfStream: false);
            if (got < Signature.Length || !block[..Signature.Length].SequenceEqual(Signature)) continue;
            return (at, RecordedLength(block[..got]));
        }
        return (null, null);
    }

    // Versions 0 and 1: offsets and lengths sizes at bytes 13 and 14, the base address at 24 (28 in version 1) and the
    // end-of-file address two addresses later. Versions 2 and 3: offsets size at byte 9, the base address at 12 and the
    // end-of-file address two addresses later. Addresses are relative to the base address.
    private static long? RecordedLength(ReadOnlySpan<byte> block)
    {
        if (block.Length < 9) return null;
        var version = block[8];
        int size, baseAt;
        switch (version)
        {
            case 0 or 1 when block.Length > 14:
                size = block[13];
                baseAt = version == 0 ? 24 : 28;
                break;
            case 2 or 3 when block.Length > 9:
                size = block[9];
                baseAt = 12;
                break;
            default:
                return null;
        }
        if (size is not (2 or 4 or 8) || baseAt + 3 * size > block.Length) return null;
        var baseAddress = Address(block, baseAt, size);
        var end = Address(block, baseAt + 2 * size, size);
        var undefined = size == 8 ? ulong.MaxValue : (1UL << (8 * size)) - 1;
        if (end == undefined || baseAddress == undefined || end > long.MaxValue - baseAddress) return null;
        return (long)(baseAddress + end);
    }

    private static ulong Address(ReadOnlySpan<byte> block, int at, int size) => size switch
    {
        2 => BinaryPrimitives.ReadUInt16LittleEndian(block[at..]),
        4 => BinaryPrimitives.ReadUInt32LittleEndian(block[at..]),
        _ => BinaryPrimitives.ReadUInt64LittleEndian(block[at..]),
    };
}
