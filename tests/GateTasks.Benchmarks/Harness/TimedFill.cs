using System.Diagnostics;
using System.Text.Json;
using GateTasks.Engine.Histograms;
using GateTasks.Engine.References;
using GateTasks.Engine.Samples;

namespace GateTasks.Benchmarks.Harness;

/// <summary>
/// The engine's histogramming alone, in-process and after start-up: streams the sample through the engine's reader
/// (row group by row group, columns decoded side by side and each float32 column filled by the thread that decoded it, as a check does) and fills one histogram per feature with
/// the reference's axes, features side by side on the sample's threads (the machine's cores). The
/// time covers Parquet decoding and filling, the same work the independent engines are timed on; the cells are
/// written out so the script can compare them.
/// </summary>
internal static class TimedFill
{
    public static void Run(string referencePath, string samplePath, string jsonPath)
    {
        var reference = ReferenceFile.Read(referencePath);
        var columns = reference.Features.Select(f => f.Column).ToList();

        var clock = Stopwatch.StartNew();
        var histograms = reference.Features.Select(f => new Histogram(f.Histogram.Axis)).ToArray();
        var sample = Sample.Open([samplePath]);
        long events = 0;
        // As a check fills them: a float32 column on the thread that decoded it, as soon as it is decoded.
        var pass = ReadPass.Default with { OnDecoded = (c, values) => { histograms[c].Fill(values); return true; } };
        foreach (var batch in sample.ReadBatches(columns, pass))
        {
            // The rest as a check fills them: the features of a batch side by side on the sample's threads.
            Parallel.For(0, histograms.Length, new ParallelOptions { MaxDegreeOfParallelism = ReadPass.Default.Parallelism },
                c =>
                {
                    if (batch.TakenOnDecoding(c)) return;
                    // Float32 columns as the check fills them: as stored, without converting them to doubles.
                    var stored = batch.Float32Column(c);
                    if (stored.IsEmpty) histograms[c].Fill(batch.Column(c), ReadOnlySpan<double>.Empty);
                    else histograms[c].Fill(stored);
                });
            events += batch.RowCount;
        }
        var seconds = clock.Elapsed.TotalSeconds;
        var allocated = GC.GetTotalAllocatedBytes();

        using var stream = File.Create(jsonPath);
        using var json = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true });
        json.WriteStartObject();
        json.WriteNumber("seconds", seconds);
        json.WriteNumber("events", events);
        // What the managed heap went through, to tell decoding garbage from resident memory.
        json.WriteNumber("allocated_bytes", allocated);
        json.WriteNumber("gc_gen0", GC.CollectionCount(0));
        json.WriteNumber("gc_gen1", GC.CollectionCount(1));
        json.WriteNumber("gc_gen2", GC.CollectionCount(2));
        json.WriteStartObject("features");
        for (var c = 0; c < histograms.Length; c++)
        {
            json.WriteStartArray(reference.Features[c].Name);
            foreach (var w in histograms[c].SumW) json.WriteNumberValue((long)w);
            json.WriteEndArray();
        }
        json.WriteEndObject();
        json.WriteEndObject();
    }
}
