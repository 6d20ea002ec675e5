namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// What the plain-column reader needs of a Parquet page header (parquet-format's <c>PageHeader</c> with its data-page
/// headers v1 and v2), read with <see cref="ThriftCompactReader"/>; the rest (statistics) is skipped. <see cref="Crc"/>
/// is the page's optional CRC-32 (parquet-format: over the page's bytes as stored, after the header).
/// </summary>
internal readonly record struct ParquetPageHeader(
    int Type,
    int UncompressedSize,
    int CompressedSize,
    int Values,
    int Encoding,
    int DefinitionLevelEncoding,
    int DefinitionLevelsLength,
    int RepetitionLevelsLength,
    bool ValuesCompressed,
    uint? Crc)
{
    /// <summary>parquet-format page types.</summary>
    public const int DataPage = 0, IndexPage = 1, DictionaryPage = 2, DataPageV2 = 3;

    /// <summary>Reads a header from the start of <paramref name="bytes"/>; <paramref name="length"/> is its size in bytes.</summary>
    public static ParquetPageHeader Read(ReadOnlySpan<byte> bytes, out int length)
    {
        var reader = new ThriftCompactReader(bytes);
        int type = -1, uncompressed = -1, compressed = -1, values = -1, encoding = -1, definitionEncoding = -1;
        int definitionLength = 0, repetitionLength = 0;
        var valuesCompressed = true;
        uint? crc = null;
        short last = 0;
        while (true)
        {
            var (id, kind) = reader.ReadFieldHeader(last);
            if (kind == ThriftCompactReader.Stop) break;
            last = id;
            switch (id)
            {
                case 1 when kind == ThriftCompactReader.I32: type = reader.ReadInt32(); break;
                case 2 when kind == ThriftCompactReader.I32: uncompressed = reader.ReadInt32(); break;
                case 3 when kind == ThriftCompactReader.I32: compressed = reader.ReadInt32(); break;
                case 4 when kind == ThriftCompactReader.I32: crc = unchecked((uint)reader.ReadInt32()); break;
                case 5 when kind == ThriftCompactReader.Struct:
                {
                    // DataPageHeader: 1 num_values, 2 encoding, 3 definition_level_encoding, 4 repetition_level_encoding.
                    short inner = 0;
                    while (true)
                    {
                        var (f, k) = reader.ReadFieldHeader(inner);
                        if (k == ThriftCompactReader.Stop) break;
                        inner = f;
                        if (k == ThriftCompactReader.I32 && f is 1 or 2 or 3)
                        {
                            var v = reader.ReadInt32();
                            if (f == 1) values = v; else if (f == 2) encoding = v; else definitionEncoding = v;
                        }
                        else reader.Skip(k);
                    }
                    break;
                }
                case 8 when kind == ThriftCompactReader.Struct:
                {
                    // DataPageHeaderV2: 1 num_values, 4 encoding, 5 definition_levels_byte_length,
                    // 6 repetition_levels_byte_length, 7 is_compressed (default true).
                    short inner = 0;
                    while (true)
                    {
                        var (f, k) = reader.ReadFieldHeader(inner);
                        if (k == ThriftCompactReader.Stop) break;
                        inner = f;
                        if (f == 7 && k is ThriftCompactReader.BoolTrue or ThriftCompactReader.BoolFalse)
                            valuesCompressed = k == ThriftCompactReader.BoolTrue;
                        else if (k == ThriftCompactReader.I32 && f is 1 or 4 or 5 or 6)
                        {
                            var v = reader.ReadInt32();
                            if (f == 1) values = v; else if (f == 4) encoding = v; else if (f == 5) definitionLength = v; else repetitionLength = v;
                        }
                        else reader.Skip(k);
                    }
                    break;
                }
                default: reader.Skip(kind); break;
            }
        }
        length = reader.Position;
        if (type < 0 || uncompressed < 0 || compressed < 0 || definitionLength < 0 || repetitionLength < 0)
            throw new InvalidDataException("a page header lacks its type or sizes");
        return new ParquetPageHeader(type, uncompressed, compressed, values, encoding, definitionEncoding,
            definitionLength, repetitionLength, valuesCompressed, crc);
    }
}
