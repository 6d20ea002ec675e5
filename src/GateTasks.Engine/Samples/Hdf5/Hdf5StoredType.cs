using PureHDF;

namespace GateTasks.Engine.Samples.Hdf5;

/// <summary>
/// How an HDF5 dataset or compound member stores its values: as a number GateTasks reads (booleans as h5py writes
/// them, an enumeration of FALSE = 0 and TRUE = 1 over one byte; signed and unsigned integers of 1 to 8 bytes;
/// float32 and float64; either byte order), or as something else, described in words for the message.
/// </summary>
internal readonly record struct Hdf5StoredType(PackedNumber? Number, string Kind)
{
    /// <summary>The stored type of <paramref name="type"/>.</summary>
    public static Hdf5StoredType Of(IH5DataType type)
    {
        switch (type.Class)
        {
            case H5DataTypeClass.FloatingPoint when type.Size is 4 or 8:
                return Numeric(type.Size == 4 ? SampleValueType.Float32 : SampleValueType.Float64, type);
            case H5DataTypeClass.FloatingPoint:
                return new(null, $"float{type.Size * 8} (GateTasks reads float32 and float64)");
            case H5DataTypeClass.FixedPoint when type.Size is 1 or 2 or 4 or 8:
                var signed = type.FixedPoint.IsSigned;
                return Numeric(type.Size switch
                {
                    1 => signed ? SampleValueType.Int8 : SampleValueType.UInt8,
                    2 => signed ? SampleValueType.Int16 : SampleValueType.UInt16,
                    4 => signed ? SampleValueType.Int32 : SampleValueType.UInt32,
                    _ => signed ? SampleValueType.Int64 : SampleValueType.UInt64,
                }, type);
            case H5DataTypeClass.Enumerated when type.Size == 1 && IsBoolean(type):
                return new(new PackedNumber(SampleValueType.Boolean, false), "bool");
            case H5DataTypeClass.Compound when IsComplex(type):
                return new(null, $"complex{type.Size * 8}");
            default:
                return new(null, type.Class switch
                {
                    H5DataTypeClass.String => "a string",
                    H5DataTypeClass.VariableLength => "variable-length data (strings or sequences)",
                    H5DataTypeClass.Compound => "a compound (a record of several values)",
                    H5DataTypeClass.Enumerated => "an enumeration",
                    H5DataTypeClass.Array => "an array in each element",
                    H5DataTypeClass.Opaque => "opaque bytes",
                    H5DataTypeClass.BitField => "a bit field",
                    H5DataTypeClass.Reference => "object references",
                    H5DataTypeClass.Time => "a time",
                    _ => $"the HDF5 type class {type.Class} of {type.Size} bytes",
                });
        }
    }

    private static Hdf5StoredType Numeric(SampleValueType value, IH5DataType type)
    {
        if (type.Size == 1) return new(new PackedNumber(value, false), new PackedNumber(value, false).ToString());
        if (Hdf5ByteOrder.IsBigEndian(type) is not { } big)
            return new(null, $"{value.ToString().ToLowerInvariant()} in a byte order the HDF5 reader does not state");
        var number = new PackedNumber(value, big);
        return new(number, number.ToString());
    }

    // h5py stores numpy's bool as an enumeration over int8 with FALSE = 0 and TRUE = 1.
    private static bool IsBoolean(IH5DataType type)
    {
        try
        {
            var members = type.Enumeration.GetMembers<sbyte>();
            return members.Count == 2 && members.TryGetValue("FALSE", out var no) && no == 0 && members.TryGetValue("TRUE", out var yes) && yes == 1;
        }
        catch (Exception ex) when (ex is not OutOfMemoryException)
        {
            return false;
        }
    }

    // h5py stores numpy's complex numbers as a compound of two floats named r and i.
    private static bool IsComplex(IH5DataType type)
    {
        var members = type.Compound.Members;
        return members.Length == 2 && members[0].Name == "r" && members[1].Name == "i"
               && members.All(m => m.Type.Class == H5DataTypeClass.FloatingPoint);
    }
}
