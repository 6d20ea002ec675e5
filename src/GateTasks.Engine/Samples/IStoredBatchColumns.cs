namespace GateTasks.Engine.Samples;

/// <summary>
/// A batch's columns as the reader holds them in their stored types, converted to doubles only when a column is first
/// asked for (<see cref="SampleBatch"/>): a float32 column that only feeds a histogram and its moments is then read as
/// floats and never converted.
/// </summary>
internal interface IStoredBatchColumns
{
    /// <summary>Writes column <paramref name="column"/>'s values of the batch as doubles (a null as NaN).</summary>
    void Convert(int column, Span<double> destination);

    /// <summary>Column <paramref name="column"/>'s values of the batch where it is stored as float32 without a null; else empty.</summary>
    ReadOnlySpan<float> Float32(int column);

    /// <summary>Whether column <paramref name="column"/>'s values of the batch were taken as they were decoded (<see cref="DecodedFloat32Slice"/>).</summary>
    bool TakenOnDecoding(int column) => false;
}
