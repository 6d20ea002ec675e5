using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.IO;
using Parquet;
using Parquet.Schema;

namespace GateTasks.Engine.Demo;

/// <summary>
/// Writes a demo sample as a Snappy-compressed Parquet file, one row group per generated chunk, so memory is
/// bounded by the row-group size whatever the number of events.
/// </summary>
internal static class DemoSampleWriter
{
    /// <summary>Row-group size used when the caller has no preference.</summary>
    public const int DefaultRowGroupSize = 100_000;

    private static readonly DataField<float> MassGg = new(DemoColumns.MassGg, false);
    private static readonly DataField<float> PtGg = new(DemoColumns.PtGg, false);
    private static readonly DataField<float> EnergyLead = new(DemoColumns.EnergyLead, false);
    private static readonly DataField<float> EnergySublead = new(DemoColumns.EnergySublead, false);
    private static readonly DataField<float> EtaLead = new(DemoColumns.EtaLead, false);
    private static readonly DataField<float> EtaSublead = new(DemoColumns.EtaSublead, false);
    private static readonly DataField<float> PhiLead = new(DemoColumns.PhiLead, false);
    private static readonly DataField<float> PhiSublead = new(DemoColumns.PhiSublead, false);
    private static readonly DataField<float> CosThetaStar = new(DemoColumns.CosThetaStar, false);
    private static readonly DataField<int> JetCount = new(DemoColumns.JetCount, false);
    private static readonly DataField<float> LeadJetPt = new(DemoColumns.LeadJetPt, false);
    private static readonly DataField<int> LeadConverted = new(DemoColumns.LeadConverted, false);
    private static readonly DataField<float> EnergyLeadTrue = new(DemoColumns.EnergyLeadTrue, false);
    private static readonly DataField<float> EnergySubleadTrue = new(DemoColumns.EnergySubleadTrue, false);
    private static readonly DataField<float> Weight = new(DemoColumns.Weight, false);

    /// <summary>The file schema, fields in <see cref="DemoColumns.All"/> order.</summary>
    public static ParquetSchema Schema { get; } = new(
        MassGg, PtGg, EnergyLead, EnergySublead, EtaLead, EtaSublead, PhiLead, PhiSublead, CosThetaStar, JetCount, LeadJetPt,
        LeadConverted, EnergyLeadTrue, EnergySubleadTrue, Weight);

    /// <summary>
    /// Generates <paramref name="events"/> selected events of scenario <paramref name="p"/> with
    /// <paramref name="seed"/> and writes them to <paramref name="path"/> (overwritten). Same arguments, same bytes.
    /// An unwritable path throws <see cref="GateInputException"/> with <see cref="ErrorCodes.OutputNotWritable"/>.
    /// </summary>
    public static void Write(string path, DemoScenarioParameters p, int events, int seed, int rowGroupSize) =>
        WriteAsync(path, p, events, seed, rowGroupSize).GetAwaiter().GetResult();

    /// <inheritdoc cref="Write"/>
    public static async Task WriteAsync(string path, DemoScenarioParameters p, int events, int seed, int rowGroupSize,
        CancellationToken cancellationToken = default)
    {
        ArgumentException.ThrowIfNullOrEmpty(path);
        ArgumentNullException.ThrowIfNull(p);
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(events);
        ArgumentOutOfRangeException.ThrowIfNegativeOrZero(rowGroupSize);

        var simulation = new ToyDiphotonSimulation(p, seed);
        var chunk = new DemoEventChunk(Math.Min(rowGroupSize, events));
        // Never over a device or a pipe (GATE0005).
        OutputPathGuard.VerifyKind(new RunFile(path, "the demo sample"));
        FileStream stream;
        try
        {
            stream = new FileStream(path, FileMode.Create, FileAccess.ReadWrite, FileShare.None, 1 << 16);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or NotSupportedException)
        {
            throw new GateInputException(ErrorCodes.OutputNotWritable,
                $"cannot write demo sample '{path}': {e.Message}", new SourceLocation(path), e);
        }

        await using (stream.ConfigureAwait(false))
        {
            var options = new ParquetOptions { CompressionMethod = CompressionMethod.Snappy };
            var writer = await ParquetWriter.CreateAsync(Schema, stream, options, false, cancellationToken)
                .ConfigureAwait(false);
            await using (writer.ConfigureAwait(false))
            {
                for (var written = 0; written < events; written += chunk.Count)
                {
                    simulation.Generate(chunk, Math.Min(chunk.Capacity, events - written));
                    await WriteRowGroupAsync(writer, chunk, cancellationToken).ConfigureAwait(false);
                }
            }
        }
    }

    private static async Task WriteRowGroupAsync(ParquetWriter writer, DemoEventChunk chunk, CancellationToken ct)
    {
        var n = chunk.Count;
        using var group = writer.CreateRowGroup();
        await group.WriteAsync<float>(MassGg, chunk.MassGg.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(PtGg, chunk.PtGg.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(EnergyLead, chunk.EnergyLead.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(EnergySublead, chunk.EnergySublead.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(EtaLead, chunk.EtaLead.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(EtaSublead, chunk.EtaSublead.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(PhiLead, chunk.PhiLead.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(PhiSublead, chunk.PhiSublead.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(CosThetaStar, chunk.CosThetaStar.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<int>(JetCount, chunk.JetCount.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(LeadJetPt, chunk.LeadJetPt.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<int>(LeadConverted, chunk.LeadConverted.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(EnergyLeadTrue, chunk.EnergyLeadTrue.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(EnergySubleadTrue, chunk.EnergySubleadTrue.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
        await group.WriteAsync<float>(Weight, chunk.Weight.AsMemory(0, n), null, null, ct).ConfigureAwait(false);
    }
}
