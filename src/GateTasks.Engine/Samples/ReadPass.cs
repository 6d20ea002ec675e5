namespace GateTasks.Engine.Samples;

/// <summary>
/// How one pass over a sample is run: what it is for (as progress reports name it), who is told how far it has got
/// (null for silence), and how many threads it may use (decoding columns, visiting features; null: the machine's
/// processor count, which <c>DOTNET_PROCESSOR_COUNT</c> lowers for a whole process). The results never depend on
/// the threads.
/// </summary>
internal sealed record ReadPass(string Phase, IProgress<ReadProgress>? Progress = null, int? Threads = null)
{
    /// <summary>Offered float32 columns as they are decoded (<see cref="DecodedFloat32Slice"/>); null: not offered.</summary>
    public DecodedFloat32Slice? OnDecoded { get; init; }

    /// <summary>
    /// Per requested column: true where a slice taken by <see cref="OnDecoded"/> is never read again, so the reader may
    /// reuse the column's memory (<see cref="ISampleReader.ReadBatches(IReadOnlyList{string}, int, DecodedFloat32Slice?, IReadOnlyList{bool}?)"/>);
    /// null: none.
    /// </summary>
    public IReadOnlyList<bool>? UnreadOnceTaken { get; init; }

    /// <summary>A silent pass on every core.</summary>
    public static readonly ReadPass Default = new("reading the sample");

    /// <summary>The threads the pass uses: at least one.</summary>
    public int Parallelism => Math.Max(1, Threads ?? Environment.ProcessorCount);

    /// <summary>The same settings for another phase.</summary>
    public ReadPass For(string phase) => this with { Phase = phase };
}
