using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Microsoft.Win32.SafeHandles;
using Parquet;
using Parquet.Meta;
using Parquet.Schema;

namespace GateTasks.Engine.Samples.Parquet;

/// <summary>
/// Reads one flat numeric Parquet column, row group by row group, in its stored type, and hands it out as
/// <see cref="double"/> slice by slice (or as stored, for a float32 column without nulls). The stored-type buffers are kept and reused for the next row group, so a file
/// costs one row group of stored values per column (plus one slice of doubles) however many row groups it has.
/// </summary>
internal abstract class ParquetColumnDecoder
{
    /// <summary>The decoder for <paramref name="field"/>, stored as <paramref name="type"/>.</summary>
    public static ParquetColumnDecoder Create(DataField field, SampleValueType type) => type switch
    {
        SampleValueType.Float32 => new Typed<float>(field),
        SampleValueType.Float64 => new Typed<double>(field),
        SampleValueType.Int8 => new Typed<sbyte>(field),
        SampleValueType.Int16 => new Typed<short>(field),
        SampleValueType.Int32 => new Typed<int>(field),
        SampleValueType.Int64 => new Typed<long>(field),
        SampleValueType.UInt8 => new Typed<byte>(field),
        SampleValueType.UInt16 => new Typed<ushort>(field),
        SampleValueType.UInt32 => new Typed<uint>(field),
        SampleValueType.UInt64 => new Typed<ulong>(field),
        SampleValueType.Boolean => new Typed<bool>(field),
        _ => throw new ArgumentOutOfRangeException(nameof(type), type, "not a numeric column type"),
    };

    /// <summary>The column's name, for messages.</summary>
    public abstract string Column { get; }

    /// <summary>
    /// Reads the column's chunk in <paramref name="rowGroup"/> (<paramref name="rows"/> rows, as the metadata kept from
    /// opening describes it) into the decoder's buffers: through <paramref name="plain"/> (the calling thread's, reading
    /// <paramref name="file"/>) where it can, else through the calling thread's Parquet.Net row-group reader, opened by
    /// <paramref name="library"/> when first needed. Throws <see cref="InvalidDataException"/> when the chunk does not
    /// hold one value or null per row.
    /// </summary>
    public abstract void Read(RowGroup rowGroup, int rows, SafeFileHandle file, PlainChunkReader plain, Func<ParquetRowGroupReader> library);

    /// <summary>
    /// Converts rows <paramref name="startRow"/> on of the chunk last read into doubles, as many as
    /// <paramref name="destination"/> holds; a null becomes NaN. <paramref name="startValue"/> is the number of
    /// values (non-null rows) before <paramref name="startRow"/> (<see cref="Present"/>). Writes the same numbers
    /// however often it is called, so slices may be converted in any order and on any thread.
    /// </summary>
    public abstract void Convert(int startRow, int startValue, Span<double> destination);

    /// <summary>The values (non-null rows) among <paramref name="count"/> rows from <paramref name="startRow"/> on.</summary>
    public abstract int Present(int startRow, int count);

    /// <summary>
    /// Rows <paramref name="startRow"/> to <paramref name="startRow"/> + <paramref name="count"/> of a float32 chunk
    /// without a null, as stored; empty for any other chunk.
    /// </summary>
    public abstract ReadOnlySpan<float> Float32(int startRow, int count);

    /// <summary>
    /// Takes <paramref name="buffer"/> (one that <see cref="Release"/> gave) as the values buffer of the next read, when
    /// this decoder holds none and it is of its stored type; whether it did.
    /// </summary>
    public abstract bool Adopt(Array? buffer);

    /// <summary>
    /// Gives up the values buffer, for another column's decoder to <see cref="Adopt"/>: the chunk last read can then no
    /// longer be read from this decoder, until the next <see cref="Read"/>.
    /// </summary>
    public abstract Array Release();

    /// <summary>Whether row <paramref name="row"/> of the chunk last read is a null (for messages; not used per value).</summary>
    public abstract bool IsNull(int row);

    /// <summary>Row <paramref name="row"/>'s value as a double (for messages; not used per value); NaN for a null.</summary>
    public abstract double ValueAt(int row);

    private sealed class Typed<T>(DataField field) : ParquetColumnDecoder where T : unmanaged
    {
        private T[] _values = [];
        private int[] _definitionLevels = [];

        private bool _hasNulls;

        public override string Column => @field.Name;

        public override bool Adopt(Array? buffer)
        {
            if (_values.Length != 0 || buffer is not T[] values) return false;
            _values = values;
            return true;
        }

        public override Array Release()
        {
            var values = _values;
            _values = [];
            return values;
        }

        public override void Read(RowGroup rowGroup, int rows, SafeFileHandle file, PlainChunkReader plain, Func<ParquetRowGroupReader> library)
        {
            var metadata = ChunkOf(rowGroup)?.MetaData
                ?? throw new InvalidDataException($"column '{field.Name}' has no data in a row group");
            // A flat column stores one entry (value or null) per row; anything else is a damaged or nested file.
            if (metadata.NumValues != rows)
                throw new InvalidDataException(
                    $"column '{field.Name}' holds {metadata.NumValues} values in a row group of {rows} rows");

            if (typeof(T) == typeof(bool) && HasRleBooleanValues(metadata))
                throw new NotSupportedException(
                    $"boolean column '{field.Name}' is stored with RLE-encoded values (as Parquet data page v2 writes "
                    + "booleans), which the Parquet library used here decodes wrongly; rewrite the file with data "
                    + "page v1 or store the column as an integer");

            if (_values.Length < rows) _values = new T[rows];
            var nullable = field.MaxDefinitionLevel > 0;
            if (nullable && _definitionLevels.Length < rows) _definitionLevels = new int[rows];

            _hasNulls = nullable; // until the read says otherwise
            // Who reads the chunk, decided here alone: the plain-chunk reader takes a chunk of float, double, int32 or
            // int64 values whose metadata says it is stored PLAIN (no dictionary page; PLAIN values with RLE or
            // bit-packed levels; uncompressed, Snappy, Zstandard or gzip: PlainChunkReader.Supports) and whose pages
            // all say so too (TryRead declines at the first that does not). Every other chunk (dictionary-encoded,
            // small or unsigned integers, booleans, other codecs, a page declined) is read by Parquet.Net, after the
            // plain-chunk reader has verified its pages' checksums and value counts, which the library does not.
            if (PlainChunkReader.Supports<T>(metadata)
                && plain.TryRead(file, metadata, field.MaxDefinitionLevel, rows, _values.AsSpan(0, rows), _definitionLevels.AsSpan(0, nullable ? rows : 0)))
            {
                _hasNulls = nullable && Present(0, rows) < rows;
                return;
            }

            plain.VerifyChecksums(file, metadata);
            // The raw read fills the values densely (nulls skipped) plus one definition level per row, into our
            // buffers; the library's nullable overload would allocate two temporary buffers per row group.
            library().ReadRawAsync<T>(
                    field,
                    _values.AsMemory(0, rows),
                    nullable ? _definitionLevels.AsMemory(0, rows) : (Memory<int>?)null, // a bare null would become an empty Memory
                    null)
                .AsTask().GetAwaiter().GetResult();
            _hasNulls = nullable && Present(0, rows) < rows;
        }

        // As Parquet.Net maps a row group's chunks to fields: by their path in the schema, a later chunk of one path
        // taking the place of an earlier one.
        private ColumnChunk? ChunkOf(RowGroup rowGroup)
        {
            ColumnChunk? found = null;
            foreach (var chunk in rowGroup.Columns ?? [])
                if (chunk.MetaData?.PathInSchema is { } path && field.Path.Equals(new FieldPath(path)))
                    found = chunk;
            return found;
        }

        public override bool IsNull(int row) => field.MaxDefinitionLevel > 0 && _definitionLevels[row] < field.MaxDefinitionLevel;

        public override double ValueAt(int row) => IsNull(row) ? double.NaN : ToDouble(_values[_hasNulls ? Present(0, row) : row]);

        public override int Present(int startRow, int count)
        {
            if (!_hasNulls) return count;
            var maxLevel = field.MaxDefinitionLevel;
            var present = 0;
            foreach (var level in _definitionLevels.AsSpan(startRow, count))
                if (level >= maxLevel) present++;
            return present;
        }

        public override ReadOnlySpan<float> Float32(int startRow, int count) =>
            typeof(T) == typeof(float) && !_hasNulls
                ? System.Runtime.InteropServices.MemoryMarshal.Cast<T, float>(_values.AsSpan(startRow, count))
                : ReadOnlySpan<float>.Empty;

        [MethodImpl(MethodImplOptions.AggressiveOptimization)]
        public override void Convert(int startRow, int startValue, Span<double> destination)
        {
            if (!_hasNulls)
            {
                var values = _values.AsSpan(startRow, destination.Length);
                if (typeof(T) == typeof(double))
                    System.Runtime.InteropServices.MemoryMarshal.Cast<T, double>(values).CopyTo(destination);
                else if (typeof(T) == typeof(float))
                    Widen(System.Runtime.InteropServices.MemoryMarshal.Cast<T, float>(values), destination);
                else
                    for (var i = 0; i < destination.Length; i++) destination[i] = ToDouble(values[i]);
                return;
            }

            var maxLevel = field.MaxDefinitionLevel;
            var levels = _definitionLevels.AsSpan(startRow, destination.Length);
            var next = startValue;
            for (var i = 0; i < destination.Length; i++)
                destination[i] = levels[i] < maxLevel ? double.NaN : ToDouble(_values[next++]);
        }

        // float → double is exact; eight at a time where the processor has the registers.
        private static void Widen(ReadOnlySpan<float> values, Span<double> destination)
        {
            var i = 0;
            if (Vector256.IsHardwareAccelerated)
                for (; i + 8 <= values.Length; i += 8)
                {
                    var (lower, upper) = Vector256.Widen(Vector256.Create(values.Slice(i, 8)));
                    lower.CopyTo(destination.Slice(i, 4));
                    upper.CopyTo(destination.Slice(i + 4, 4));
                }
            for (; i < values.Length; i++) destination[i] = values[i];
        }

        // Parquet.Net 6.1 returns wrong values (or divides by zero) for RLE-encoded booleans, found by comparing
        // with files written by Apache Arrow's writer; refusing is better than a silently wrong histogram.
        // Booleans are PLAIN or RLE; levels are always RLE, so without page statistics "no PLAIN" means RLE values.
        private static bool HasRleBooleanValues(ColumnMetaData metadata) =>
            metadata.EncodingStats is { Count: > 0 } pages
                ? pages.Any(p => p.PageType is global::Parquet.Meta.PageType.DATA_PAGE or global::Parquet.Meta.PageType.DATA_PAGE_V2
                                 && p.Encoding == global::Parquet.Meta.Encoding.RLE)
                : !metadata.Encodings.Contains(global::Parquet.Meta.Encoding.PLAIN);

        // typeof(T) tests on a value type are constants to the JIT, so each instantiation keeps only its own branch.
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        private static double ToDouble(T value)
        {
            if (typeof(T) == typeof(float)) return Unsafe.As<T, float>(ref value);
            if (typeof(T) == typeof(double)) return Unsafe.As<T, double>(ref value);
            if (typeof(T) == typeof(sbyte)) return Unsafe.As<T, sbyte>(ref value);
            if (typeof(T) == typeof(short)) return Unsafe.As<T, short>(ref value);
            if (typeof(T) == typeof(int)) return Unsafe.As<T, int>(ref value);
            if (typeof(T) == typeof(long)) return Unsafe.As<T, long>(ref value);
            if (typeof(T) == typeof(byte)) return Unsafe.As<T, byte>(ref value);
            if (typeof(T) == typeof(ushort)) return Unsafe.As<T, ushort>(ref value);
            if (typeof(T) == typeof(uint)) return Unsafe.As<T, uint>(ref value);
            if (typeof(T) == typeof(ulong)) return Unsafe.As<T, ulong>(ref value);
            if (typeof(T) == typeof(bool)) return Unsafe.As<T, bool>(ref value) ? 1.0 : 0.0;
            throw new NotSupportedException(typeof(T).Name);
        }
    }
}
