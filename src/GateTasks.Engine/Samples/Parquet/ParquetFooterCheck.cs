using System.Buffers.Binary;

namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// Checks a Parquet file's frame (magic bytes, footer length) and that its footer is well-formed Thrift compact
/// protocol before Parquet.Net decodes it. Parquet.Net trusts element counts in the footer; garbage there
/// (a damaged or truncated file) can make it loop for minutes or ask for gigabytes. The footer is walked with
/// <see cref="ThriftCompactReader"/>, where every count must fit in the bytes that remain, so damage is reported at once.
/// </summary>
/// <remarks>
/// File layout and footer encoding: Apache Parquet format specification (parquet-format, "File format");
/// Thrift compact protocol specification (Apache Thrift, doc/specs/thrift-compact-protocol.md).
/// </remarks>
internal static class ParquetFooterCheck
{
    private const int FrameBytes = 4 + 8; // leading magic; footer length and trailing magic

    /// <summary>Why the file at <paramref name="stream"/> is not a readable Parquet file, or null when it looks sound.</summary>
    public static string? Problem(Stream stream)
    {
        var length = stream.Length;
        if (length < FrameBytes)
            return $"the file is {length} bytes long, too short for Parquet (it may be truncated)";

        Span<byte> head = stackalloc byte[4];
        Span<byte> tail = stackalloc byte[8];
        stream.Position = 0;
        stream.ReadExactly(head);
        stream.Position = length - 8;
        stream.ReadExactly(tail);

        if (tail[4..].SequenceEqual("PARE"u8))
            return "the file is an encrypted Parquet file, which is not supported";
        if (!head.SequenceEqual("PAR1"u8))
            return "the file does not start with the Parquet signature PAR1";
        if (!tail[4..].SequenceEqual("PAR1"u8))
            return "the file does not end with the Parquet signature PAR1 (it may be truncated)";

        var footerLength = BinaryPrimitives.ReadInt32LittleEndian(tail);
        if (footerLength <= 0 || footerLength > length - FrameBytes)
            return $"the footer length {footerLength} does not fit in the file (it may be truncated)";

        var footer = new byte[footerLength];
        stream.Position = length - 8 - footerLength;
        stream.ReadExactly(footer);
        stream.Position = 0;

        return IsOneStruct(footer) ? null : "the footer (file metadata) is damaged";
    }

    // The footer is one FileMetaData struct and nothing after it.
    private static bool IsOneStruct(ReadOnlySpan<byte> footer)
    {
        var reader = new ThriftCompactReader(footer);
        try
        {
            reader.Skip(ThriftCompactReader.Struct);
            return reader.AtEnd;
        }
        catch (Exception ex) when (ex is InvalidDataException or OverflowException)
        {
            return false;
        }
    }
}
