using System.Buffers.Binary;

namespace GateTasks.Engine.Samples;

/// <summary>
/// A number stored in a fixed number of bytes at a fixed place of each record, in either byte order: the fields of a
/// NumPy structured array, the members of an HDF5 compound. Decodes a block of records into doubles.
/// </summary>
internal readonly record struct PackedNumber(SampleValueType Type, bool BigEndian)
{
    /// <summary>
    /// Bytes of packed records a reader reads at once at most: with wide records a batch holds fewer rows, so memory
    /// stays bounded by this block, whatever the file's length or the record's width.
    /// </summary>
    public const int BlockBytes = 8 << 20;

    /// <summary>Bytes one value takes.</summary>
    public int Size => Type switch
    {
        SampleValueType.Int8 or SampleValueType.UInt8 or SampleValueType.Boolean => 1,
        SampleValueType.Int16 or SampleValueType.UInt16 => 2,
        SampleValueType.Int32 or SampleValueType.UInt32 or SampleValueType.Float32 => 4,
        SampleValueType.Int64 or SampleValueType.UInt64 or SampleValueType.Float64 => 8,
        _ => throw new InvalidOperationException($"{Type} is not a packed number"),
    };

    /// <summary>
    /// The value at byte <paramref name="offset"/> of each of the first <c>into.Length</c> records of
    /// <paramref name="records"/> (each <paramref name="stride"/> bytes long), as doubles: exact for every stored
    /// value except 64-bit integers beyond 2^53, which round to the nearest double (as Parquet's are). A boolean is
    /// 1 when its byte is not zero.
    /// </summary>
    public void Decode(ReadOnlySpan<byte> records, int stride, int offset, Span<double> into)
    {
        var big = BigEndian;
        var at = offset;
        switch (Type)
        {
            case SampleValueType.Float64:
                for (var r = 0; r < into.Length; r++, at += stride)
                    into[r] = big ? BinaryPrimitives.ReadDoubleBigEndian(records[at..]) : BinaryPrimitives.ReadDoubleLittleEndian(records[at..]);
                break;
            case SampleValueType.Float32:
                for (var r = 0; r < into.Length; r++, at += stride)
                    into[r] = big ? BinaryPrimitives.ReadSingleBigEndian(records[at..]) : BinaryPrimitives.ReadSingleLittleEndian(records[at..]);
                break;
            case SampleValueType.Int8:
                for (var r = 0; r < into.Length; r++, at += stride) into[r] = (sbyte)records[at];
                break;
            case SampleValueType.UInt8:
                for (var r = 0; r < into.Length; r++, at += stride) into[r] = records[at];
                break;
            case SampleValueType.Boolean:
                for (var r = 0; r < into.Length; r++, at += stride) into[r] = records[at] != 0 ? 1 : 0;
                break;
            case SampleValueType.Int16:
                for (var r = 0; r < into.Length; r++, at += stride)
                    into[r] = big ? BinaryPrimitives.ReadInt16BigEndian(records[at..]) : BinaryPrimitives.ReadInt16LittleEndian(records[at..]);
                break;
            case SampleValueType.UInt16:
                for (var r = 0; r < into.Length; r++, at += stride)
                    into[r] = big ? BinaryPrimitives.ReadUInt16BigEndian(records[at..]) : BinaryPrimitives.ReadUInt16LittleEndian(records[at..]);
                break;
            case SampleValueType.Int32:
                for (var r = 0; r < into.Length; r++, at += stride)
                    into[r] = big ? BinaryPrimitives.ReadInt32BigEndian(records[at..]) : BinaryPrimitives.ReadInt32LittleEndian(records[at..]);
                break;
            case SampleValueType.UInt32:
                for (var r = 0; r < into.Length; r++, at += stride)
                    into[r] = big ? BinaryPrimitives.ReadUInt32BigEndian(records[at..]) : BinaryPrimitives.ReadUInt32LittleEndian(records[at..]);
                break;
            case SampleValueType.Int64:
                for (var r = 0; r < into.Length; r++, at += stride)
                    into[r] = big ? BinaryPrimitives.ReadInt64BigEndian(records[at..]) : BinaryPrimitives.ReadInt64LittleEndian(records[at..]);
                break;
            case SampleValueType.UInt64:
                for (var r = 0; r < into.Length; r++, at += stride)
                    into[r] = big ? BinaryPrimitives.ReadUInt64BigEndian(records[at..]) : BinaryPrimitives.ReadUInt64LittleEndian(records[at..]);
                break;
            default:
                throw new InvalidOperationException($"{Type} is not a packed number");
        }
    }

    /// <summary>The type as NumPy names it, with its byte order where it has one (<c>float32, big-endian</c>).</summary>
    public override string ToString() =>
        Type.ToString().ToLowerInvariant().Replace("boolean", "bool") + (Size > 1 ? (BigEndian ? ", big-endian" : ", little-endian") : "");
}
