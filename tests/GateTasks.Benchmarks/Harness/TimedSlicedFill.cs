using System.Diagnostics;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.References;
using GateTasks.Engine.Samples;

namespace GateTasks.Benchmarks.Harness;

/// <summary>
/// The sliced fill's per-event parts on one thread, timed in-process by the thread's own clock over a sample read into
/// memory first: the whole <see cref="SlicedHistogramCounter.Add"/> (unit weights), the projection alone, and the K
/// cell lookups alone on projected values; each printed as ns per event and per projection and event (median of the
/// repeats). For profiling the joint block's streaming cost apart from decoding and start-up.
/// </summary>
internal static class TimedSlicedFill
{
    private const int BatchRows = 1 << 16;

    public static void Run(string referencePath, string samplePath, int repeats)
    {
        var reference = ReferenceFile.Read(referencePath);
        var grid = reference.Sliced?.Grid ?? throw new ArgumentException($"{referencePath} has no sliced histograms");
        var d = grid.Features.Count;
        var columns = new List<double>[d];
        for (var j = 0; j < d; j++) columns[j] = [];
        var sample = Sample.Open([samplePath]);
        foreach (var batch in sample.ReadBatches(grid.Features.ToList()))
                for (var j = 0; j < d; j++)
                {
                    var stored = batch.Float32Column(j);
                    if (stored.IsEmpty) columns[j].AddRange(batch.Column(j).ToArray());
                    else foreach (var v in stored) columns[j].Add(v);
                }
        var rows = columns[0].Count;
        var data = columns.Select(c => c.ToArray()).ToArray();
        var features = Enumerable.Range(0, d).ToArray();
        var k = grid.Projections;
        Console.WriteLine($"{rows} rows, {d} features, {k} projections, {grid.Edges[0].Length} edges each");

        double Time(Action action)
        {
            var times = new List<double>();
            for (var i = 0; i < repeats; i++)
            {
                var start = Process.GetCurrentProcess().TotalProcessorTime;
                var clock = Stopwatch.StartNew();
                action();
                times.Add(Math.Min(clock.Elapsed.TotalSeconds, (Process.GetCurrentProcess().TotalProcessorTime - start).TotalSeconds));
            }
            times.Sort();
            return times[times.Count / 2];
        }
        void Report(string what, double seconds) =>
            Console.WriteLine($"{what,-28} {seconds * 1e9 / rows,8:F1} ns/event {seconds * 1e9 / rows / k,7:F2} ns/(projection·event)");

        var batches = new List<FeatureView>();
        for (var at = 0; at < rows; at += BatchRows)
        {
            var n = Math.Min(BatchRows, rows - at);
            var slice = data.Select(c => c.AsSpan(at, n).ToArray()).ToArray();
            batches.Add(new FeatureView(slice, [], weighted: false, new long[n]) { Rows = n });
        }
        Report("Add (unit weights)", Time(() =>
        {
            var counter = grid.Counter();
            foreach (var b in batches) counter.Add(b, features);
        }));

        var projection = grid.Projection();
        var stride = k;
        var projected = new double[stride * 256];
        Report("projection only", Time(() =>
        {
            for (var at = 0; at < rows; at += 256)
                projection.ProjectRows(data, at, Math.Min(256, rows - at), projected, stride);
        }));

        // The lookups on one block of projected values per projection, repeated to cover every row.
        const int block = 2048;
        var values = new double[k][];
        for (var p = 0; p < k; p++) values[p] = new double[block];
        for (var r = 0; r < block; r++)
        {
            projection.ProjectRows(data, r, 1, projected, stride);
            for (var p = 0; p < k; p++) values[p][r] = projected[p];
        }
        var lookups = grid.Edges.Select(e => new SlicedCellLookup(e)).ToArray();
        var cells = new int[block];
        Report("cell lookups only", Time(() =>
        {
            for (var at = 0; at < rows; at += block)
                for (var p = 0; p < k; p++) lookups[p].CellsOf(values[p], cells);
        }));
    }
}
