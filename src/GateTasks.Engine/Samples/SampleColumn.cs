namespace GateTasks.Engine.Samples;

/// <summary>One column of a sample file as stored.</summary>
internal sealed record SampleColumn(string Name, SampleValueType Type, bool Nullable);

/// <summary>Stored value types the engine reads as numbers.</summary>
internal enum SampleValueType
{
    Float32,
    Float64,
    Int8,
    Int16,
    Int32,
    Int64,
    UInt8,
    UInt16,
    UInt32,
    UInt64,
    Boolean,
    /// <summary>Anything else (strings, nested types): present but not readable as numbers.</summary>
    Unsupported,
}
