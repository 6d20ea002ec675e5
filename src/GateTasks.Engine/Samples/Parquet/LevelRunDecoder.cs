namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// Decodes Parquet's RLE / bit-packing hybrid encoding (parquet-format, "Run Length Encoding / Bit-Packing Hybrid"),
/// as definition levels are stored: runs of one repeated value, and groups of eight values packed LSB first.
/// </summary>
internal static class LevelRunDecoder
{
    /// <summary>
    /// Decodes exactly <paramref name="destination"/>.Length levels of <paramref name="bitWidth"/> bits from
    /// <paramref name="source"/>; <see cref="InvalidDataException"/> when the runs end early or a level is too wide.
    /// </summary>
    public static void Decode(ReadOnlySpan<byte> source, int bitWidth, Span<int> destination)
    {
        if (bitWidth is < 0 or > 24) throw new InvalidDataException($"definition levels of {bitWidth} bits");
        var position = 0;
        var written = 0;
        var valueBytes = (bitWidth + 7) / 8;
        var mask = (1 << bitWidth) - 1;
        while (written < destination.Length)
        {
            var header = ReadVarint(source, ref position);
            if ((header & 1) == 0)
            {
                // A run: header >> 1 copies of one value stored in whole bytes, little-endian.
                var count = header >> 1;
                if (valueBytes > source.Length - position) throw new InvalidDataException("definition levels are truncated");
                var value = 0;
                for (var b = 0; b < valueBytes; b++) value |= source[position + b] << (8 * b);
                position += valueBytes;
                var take = (int)Math.Min(count, (ulong)(destination.Length - written));
                destination.Slice(written, take).Fill(value);
                written += take;
            }
            else
            {
                // Bit-packed: (header >> 1) groups of eight values, bitWidth bits each, least significant bit first.
                var groups = header >> 1;
                if (groups > int.MaxValue / 8 || (long)groups * bitWidth > source.Length - position)
                    throw new InvalidDataException("definition levels are truncated");
                var values = (long)groups * 8;
                var bytes = (int)groups * bitWidth;
                var packed = source.Slice(position, bytes);
                var take = (int)Math.Min(values, destination.Length - written);
                for (var i = 0; i < take; i++)
                {
                    var bit = i * bitWidth;
                    var word = packed[bit >> 3] | (bit / 8 + 1 < packed.Length ? packed[(bit >> 3) + 1] << 8 : 0)
                               | (bit / 8 + 2 < packed.Length ? packed[(bit >> 3) + 2] << 16 : 0)
                               | (bit / 8 + 3 < packed.Length ? packed[(bit >> 3) + 3] << 24 : 0);
                    destination[written + i] = (word >> (bit & 7)) & mask;
                }
                written += take;
                position += bytes;
            }
        }
    }

    private static ulong ReadVarint(ReadOnlySpan<byte> source, ref int position)
    {
        ulong value = 0;
        for (var shift = 0; shift < 64; shift += 7)
        {
            if (position >= source.Length) throw new InvalidDataException("definition levels are truncated");
            var b = source[position++];
            value |= (ulong)(b & 0x7F) << shift;
            if ((b & 0x80) == 0) return value;
        }
        throw new InvalidDataException("a run header of the definition levels is malformed");
    }
}
