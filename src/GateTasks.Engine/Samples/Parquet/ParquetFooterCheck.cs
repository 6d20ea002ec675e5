using System.Buffers.Binary;

namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// Checks a Parquet file's frame (magic bytes, footer length) and that its footer is well-formed Thrift compact
/// protocol before Parquet.Net decodes it. Parquet.Net trusts element counts in the footer; garbage there
/// (a damaged or truncated file) can make it loop for minutes or ask for gigabytes. Here every count must fit in
/// the bytes that remain, so damage is reported at once.
/// </summary>
/// <remarks>
/// File layout and footer encoding: Apache Parquet format specification (parquet-format, "File format");
/// Thrift compact protocol specification (Apache Thrift, doc/specs/thrift-compact-protocol.md).
/// </remarks>
internal static class ParquetFooterCheck
{
    private const int MaxDepth = 64; // the Parquet footer nests about six deep
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

        var reader = new CompactReader(footer);
        return reader.SkipStruct(0) && reader.AtEnd ? null : "the footer (file metadata) is damaged";
    }

    /// <summary>Walks compact-protocol values without building them, failing on anything out of bounds.</summary>
    private ref struct CompactReader(ReadOnlySpan<byte> data)
    {
        private readonly ReadOnlySpan<byte> _data = data;
        private int _position;

        public readonly bool AtEnd => _position == _data.Length;

        private readonly int Remaining => _data.Length - _position;

        public bool SkipStruct(int depth)
        {
            if (depth > MaxDepth) return false;
            while (true)
            {
                if (!TryReadByte(out var header)) return false;
                if (header == 0) return true; // stop field
                var type = header & 0x0F;
                if ((header >> 4) == 0 && !SkipVarint()) return false; // explicit field id
                if (type is 1 or 2) continue; // a boolean field carries its value in the header
                if (!SkipValue(type, depth)) return false;
            }
        }

        private bool SkipValue(int type, int depth)
        {
            switch (type)
            {
                case 1 or 2 or 3: return Advance(1); // boolean (inside a list) and byte
                case 4 or 5 or 6: return SkipVarint(); // i16, i32, i64
                case 7: return Advance(8); // double
                case 8: return TryReadVarint(out var size) && size <= (ulong)Remaining && Advance((int)size); // binary
                case 9 or 10: return SkipList(depth);
                case 11: return SkipMap(depth);
                case 12: return SkipStruct(depth + 1);
                case 13: return Advance(16); // uuid
                default: return false;
            }
        }

        private bool SkipList(int depth)
        {
            if (!TryReadByte(out var header)) return false;
            ulong count = (ulong)(header >> 4);
            if (count == 15 && !TryReadVarint(out count)) return false;
            // Every element takes at least one byte, so a longer list cannot be real.
            if (count > (ulong)Remaining) return false;
            var type = header & 0x0F;
            for (ulong i = 0; i < count; i++)
                if (!SkipValue(type, depth + 1)) return false;
            return true;
        }

        private bool SkipMap(int depth)
        {
            if (!TryReadVarint(out var count)) return false;
            if (count == 0) return true;
            if (!TryReadByte(out var types) || count > (ulong)Remaining / 2) return false;
            for (ulong i = 0; i < count; i++)
                if (!SkipValue(types >> 4, depth + 1) || !SkipValue(types & 0x0F, depth + 1)) return false;
            return true;
        }

        private bool SkipVarint() => TryReadVarint(out _);

        private bool TryReadVarint(out ulong value)
        {
            value = 0;
            for (var shift = 0; shift < 70; shift += 7)
            {
                if (!TryReadByte(out var b)) return false;
                value |= (ulong)(b & 0x7F) << shift;
                if ((b & 0x80) == 0) return true;
            }
            return false; // longer than any 64-bit varint
        }

        private bool TryReadByte(out int value)
        {
            if (_position >= _data.Length)
            {
                value = 0;
                return false;
            }
            value = _data[_position++];
            return true;
        }

        private bool Advance(int count)
        {
            if (count > Remaining) return false;
            _position += count;
            return true;
        }
    }
}
