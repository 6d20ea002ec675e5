namespace GateTasks.Engine.Samples;

/// <summary>
/// One column of a sample file as stored. A column of type <see cref="SampleValueType.Unsupported"/> may carry the
/// reason it cannot be read (<paramref name="Refusal"/>), which is reported only if a contract asks for it.
/// </summary>
internal sealed record SampleColumn(string Name, SampleValueType Type, bool Nullable, ColumnRefusal? Refusal = null);

/// <summary>Why a column cannot be read, with the code reported when it is asked for (e.g. GATE2003 for a string dtype).</summary>
internal sealed record ColumnRefusal(string Code, string Reason);

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
