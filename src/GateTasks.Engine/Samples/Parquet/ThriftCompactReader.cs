namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// Reads Apache Thrift's compact protocol, as Parquet stores its footer and its page headers, from a byte span: field
/// headers, zigzag varints, and skipping of whatever a reader does not need. The one hand-written reader of that
/// encoding here: page headers are read with it (<see cref="ParquetPageHeader"/>), and the footer is walked with it
/// (<see cref="ParquetFooterCheck"/>) before Parquet.Net builds the file metadata from it. Throws
/// <see cref="InvalidDataException"/> on anything malformed or truncated (<see cref="OverflowException"/> for a
/// size or field id beyond its type's range); a count longer than the bytes left cannot be real, and nesting is
/// bounded, so hostile bytes can neither loop long nor recurse without end.
/// </summary>
/// <remarks>Encoding: Apache Thrift, doc/specs/thrift-compact-protocol.md.</remarks>
internal ref struct ThriftCompactReader(ReadOnlySpan<byte> bytes)
{
    /// <summary>Compact-protocol type codes.</summary>
    public const byte Stop = 0, BoolTrue = 1, BoolFalse = 2, Byte = 3, I16 = 4, I32 = 5, I64 = 6, Double = 7,
        Binary = 8, List = 9, Set = 10, Map = 11, Struct = 12, Uuid = 13;

    private const int MaxDepth = 64; // a Parquet footer nests about six deep, a page header three
    private readonly ReadOnlySpan<byte> _bytes = bytes;

    /// <summary>Bytes consumed so far.</summary>
    public int Position { get; private set; }

    /// <summary>Whether every byte has been consumed.</summary>
    public readonly bool AtEnd => Position == _bytes.Length;

    private readonly int Remaining => _bytes.Length - Position;

    /// <summary>
    /// The next field of the current struct: its id and type, or type <see cref="Stop"/> at the struct's end.
    /// <paramref name="lastId"/> is the previous field's id in this struct (0 at its start), as ids are delta-coded.
    /// </summary>
    public (short Id, byte Type) ReadFieldHeader(short lastId)
    {
        var header = ReadByte();
        if (header == Stop) return (0, Stop);
        var type = (byte)(header & 0x0F);
        var delta = header >> 4;
        var id = delta != 0 ? (short)(lastId + delta) : checked((short)ReadZigzag());
        return (id, type);
    }

    /// <summary>An i16, i32 or i64 field's value (zigzag varint).</summary>
    public long ReadZigzag()
    {
        var raw = ReadVarint();
        return (long)(raw >> 1) ^ -(long)(raw & 1);
    }

    /// <summary>An i32 field's value; a value outside the 32-bit range is malformed.</summary>
    public int ReadInt32()
    {
        var value = ReadZigzag();
        if (value is < int.MinValue or > int.MaxValue) throw new InvalidDataException("a Thrift i32 is out of range");
        return (int)value;
    }

    /// <summary>Skips a field's value of <paramref name="type"/> (a boolean field's value lives in its header).</summary>
    public void Skip(byte type) => Skip(type, 0, element: false);

    private void Skip(byte type, int depth, bool element)
    {
        if (depth > MaxDepth) throw new InvalidDataException("Thrift structures are nested too deeply");
        switch (type)
        {
            case BoolTrue or BoolFalse:
                if (element) Advance(1); // in a list, set or map a boolean takes a byte
                return;
            case Byte: Advance(1); return;
            case I16 or I32 or I64: ReadVarint(); return;
            case Double: Advance(8); return;
            case Binary: Advance(checked((int)ReadVarint())); return;
            case Uuid: Advance(16); return;
            case List or Set:
            {
                var header = ReadByte();
                var size = header >> 4 == 15 ? checked((int)ReadVarint()) : header >> 4;
                // Every element takes at least one byte, so a longer list cannot be real.
                if (size > Remaining) throw new InvalidDataException("a Thrift structure is truncated");
                var elementType = (byte)(header & 0x0F);
                for (var i = 0; i < size; i++) Skip(elementType, depth + 1, element: true);
                return;
            }
            case Map:
            {
                var size = checked((int)ReadVarint());
                if (size == 0) return;
                var types = ReadByte();
                if (size > Remaining / 2) throw new InvalidDataException("a Thrift structure is truncated");
                for (var i = 0; i < size; i++)
                {
                    Skip((byte)(types >> 4), depth + 1, element: true);
                    Skip((byte)(types & 0x0F), depth + 1, element: true);
                }
                return;
            }
            case Struct:
            {
                while (true)
                {
                    // Only the type matters when skipping: an explicit field id is stepped over, not range-checked.
                    var header = ReadByte();
                    if (header == Stop) return;
                    if (header >> 4 == 0) ReadVarint();
                    Skip((byte)(header & 0x0F), depth + 1, element: false);
                }
            }
            default: throw new InvalidDataException($"unknown Thrift type {type}");
        }
    }

    private ulong ReadVarint()
    {
        ulong value = 0;
        for (var shift = 0; shift < 64; shift += 7)
        {
            var b = ReadByte();
            value |= (ulong)(b & 0x7F) << shift;
            if ((b & 0x80) == 0) return value;
        }
        throw new InvalidDataException("a Thrift varint is longer than 10 bytes");
    }

    private byte ReadByte()
    {
        if (Position >= _bytes.Length) throw new InvalidDataException("a Thrift structure is truncated");
        return _bytes[Position++];
    }

    private void Advance(int count)
    {
        if (count < 0 || count > _bytes.Length - Position) throw new InvalidDataException("a Thrift structure is truncated");
        Position += count;
    }
}
