namespace GateTasks.Engine.Samples;

/// <summary>
/// Offered one slice of a float32 column without nulls (the rows of one batch) right after its row group is decoded,
/// on the thread that decoded it and before the batch is handed out, so the values are used while still in that core's
/// cache instead of making a round trip through memory. Returns true when it took the values: the batch then says so
/// (<see cref="SampleBatch.TakenOnDecoding"/>) and they must not be visited again; false leaves them to the batch.
/// Slices of one column are offered in order; different columns' slices may be offered at the same time.
/// </summary>
internal delegate bool DecodedFloat32Slice(int column, ReadOnlySpan<float> values);
