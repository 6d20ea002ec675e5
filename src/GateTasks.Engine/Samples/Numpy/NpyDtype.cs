using System.Globalization;
using System.Text.RegularExpressions;

namespace GateTasks.Engine.Samples.Numpy;

/// <summary>One field of a NumPy record (or the single value of a plain array): where it lies and how it is stored.</summary>
/// <param name="Name">The field's name (empty for a plain array).</param>
/// <param name="Offset">Its byte offset in the record (below the 16 MiB a record may take, once the header is accepted).</param>
/// <param name="Number">How to decode it, or null when it is not a number GateTasks reads.</param>
/// <param name="Spelling">Its dtype as NumPy writes it (<c>'&lt;c16'</c>), for messages.</param>
/// <param name="Kind">What it holds, in words (<c>complex128</c>, <c>a string</c>), for messages.</param>
internal sealed record NpyField(string Name, long Offset, PackedNumber? Number, string Spelling, string Kind);

/// <summary>
/// A NumPy dtype as a .npy header's <c>descr</c> states it: a type string such as <c>'&lt;f8'</c>, or a list of
/// <c>(name, dtype[, shape])</c> fields for a structured array (padding appears as fields with an empty name). Types
/// read as numbers: booleans, signed and unsigned integers of 1 to 8 bytes, float32 and float64, in either byte
/// order; any other field (strings, complex numbers, dates, nested records, sub-arrays) is kept with its
/// description so that a contract asking for it is told what it is.
/// </summary>
internal sealed partial class NpyDtype
{
    private NpyDtype(long itemSize, bool structured, IReadOnlyList<NpyField> fields, bool holdsObjects, string spelling)
    {
        ItemSize = itemSize;
        Structured = structured;
        Fields = fields;
        HoldsObjects = holdsObjects;
        Spelling = spelling;
    }

    /// <summary>Bytes per element (per record of a structured array).</summary>
    public long ItemSize { get; }

    /// <summary>Whether the dtype has named fields (a structured array).</summary>
    public bool Structured { get; }

    /// <summary>The named fields (padding left out), or the one unnamed value of a plain array.</summary>
    public IReadOnlyList<NpyField> Fields { get; }

    /// <summary>Whether any part is a Python object, which NumPy stores as a pickle.</summary>
    public bool HoldsObjects { get; }

    /// <summary>The dtype as the header wrote it, for messages.</summary>
    public string Spelling { get; }

    /// <summary>The dtype <paramref name="descr"/> (the header's parsed value) describes; <see cref="FormatException"/> when it is not one.</summary>
    public static NpyDtype Parse(object? descr)
    {
        switch (descr)
        {
            case string typeString:
            {
                var (size, number, kind, objects) = Scalar(typeString);
                return new NpyDtype(size, false, [new NpyField("", 0, number, $"'{typeString}'", kind)], objects, $"'{typeString}'");
            }
            case List<object?> list:
            {
                var fields = new List<NpyField>();
                var (size, objects) = Record(list, fields, depth: 0);
                return new NpyDtype(size, true, fields, objects, "a structured dtype");
            }
            default:
                throw new FormatException("'descr' is neither a type string nor a list of fields");
        }
    }

    // The fields of a record, appended to <paramref name="fields"/> at the top level; returns the record's size.
    private static (long Size, bool Objects) Record(List<object?> list, List<NpyField>? fields, int depth)
    {
        if (depth > 8) throw new FormatException("records nested deeper than 8 levels");
        long offset = 0;
        var objects = false;
        foreach (var item in list)
        {
            if (item is not List<object?> { Count: 2 or 3 } field)
                throw new FormatException("a field of 'descr' that is not a (name, dtype) or (name, dtype, shape) tuple");
            // A field with a title is written ((title, name), dtype).
            var name = field[0] switch
            {
                string s => s,
                List<object?> { Count: 2 } titled when titled[1] is string s => s,
                _ => throw new FormatException("a field name that is not a string"),
            };
            long size;
            PackedNumber? number = null;
            string spelling, kind;
            switch (field[1])
            {
                case string typeString:
                {
                    bool fieldObjects;
                    (size, number, kind, fieldObjects) = Scalar(typeString);
                    objects |= fieldObjects;
                    spelling = $"'{typeString}'";
                    break;
                }
                case List<object?> nested:
                {
                    bool nestedObjects;
                    (size, nestedObjects) = Record(nested, null, depth + 1);
                    objects |= nestedObjects;
                    spelling = "a nested record";
                    kind = "a nested record (its fields are not columns)";
                    break;
                }
                default:
                    throw new FormatException($"field '{name}' has no type string");
            }
            if (field.Count == 3)
            {
                var shape = field[2] switch
                {
                    long n => [n],
                    List<object?> dims when dims.All(d => d is long) => dims.Cast<long>().ToArray(),
                    _ => throw new FormatException($"field '{name}' has a shape that is not a tuple of integers"),
                };
                if (shape.Any(d => d < 0)) throw new FormatException($"field '{name}' has a negative dimension");
                size = checked(shape.Aggregate(size, (a, d) => a * d));
                kind = $"a sub-array of shape ({string.Join(", ", shape)}{(shape.Length == 1 ? "," : "")}) of {spelling}";
                number = null;
            }
            if (name.Length > 0) fields?.Add(new NpyField(name, offset, number, spelling, kind));
            offset = checked(offset + size);
        }
        return (offset, objects);
    }

    [GeneratedRegex(@"^([<>|=]?)([a-zA-Z])(\d*)(\[[A-Za-z0-9]+\])?$", RegexOptions.CultureInvariant)]
    private static partial Regex TypeStringPattern();

    // One type string ('<f8', '|b1', '>i2', '<U5', '|O'): its size, how to decode it (null: not a number read), what it is.
    private static (long Size, PackedNumber? Number, string Kind, bool Objects) Scalar(string typeString)
    {
        var match = TypeStringPattern().Match(typeString);
        if (!match.Success) throw new FormatException($"'{typeString}' is not a NumPy type string");
        var order = match.Groups[1].Value;
        var code = match.Groups[2].Value[0];
        var digits = match.Groups[3].Value;
        if (code == 'O') return (8, null, "Python objects", true);
        if (digits.Length == 0 || !long.TryParse(digits, NumberStyles.None, CultureInfo.InvariantCulture, out var count))
            throw new FormatException($"'{typeString}' has no size");
        var big = order == ">" || (order == "=" && !BitConverter.IsLittleEndian);
        SampleValueType? type = (code, count) switch
        {
            ('b', 1) or ('?', 1) => SampleValueType.Boolean,
            ('i', 1) => SampleValueType.Int8,
            ('i', 2) => SampleValueType.Int16,
            ('i', 4) => SampleValueType.Int32,
            ('i', 8) => SampleValueType.Int64,
            ('u', 1) => SampleValueType.UInt8,
            ('u', 2) => SampleValueType.UInt16,
            ('u', 4) => SampleValueType.UInt32,
            ('u', 8) => SampleValueType.UInt64,
            ('f', 4) => SampleValueType.Float32,
            ('f', 8) => SampleValueType.Float64,
            _ => null,
        };
        var size = code == 'U' ? checked(count * 4) : count;
        if (type is { } t) return (size, new PackedNumber(t, big), new PackedNumber(t, big).ToString(), false);
        var kind = code switch
        {
            'c' => $"complex{count * 8}",
            'f' => $"float{count * 8} (GateTasks reads float32 and float64)",
            'U' => "a Unicode string",
            'S' or 'a' => "a byte string",
            'V' => "raw bytes (void)",
            'M' => "a datetime64",
            'm' => "a timedelta64",
            _ => $"the NumPy kind '{code}'",
        };
        return (size, null, kind, false);
    }
}
