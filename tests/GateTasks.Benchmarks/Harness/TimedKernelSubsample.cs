using System.Diagnostics;
using GateTasks.Engine.Accumulation;
using GateTasks.Engine.Samples;

namespace GateTasks.Benchmarks.Harness;

/// <summary>
/// The kernel distance's sample side alone, in-process, on a real sample: streams the file through the engine's
/// reader and times only <see cref="KernelSubsample.Add"/> on each batch (the row hash and the bottom-K store; wall
/// time, and the process's CPU time over those calls, when the reader is idle) and
/// the final feature-map pass (<see cref="KernelSubsample.Sums"/>), on one thread, so that its cost can be set
/// against a whole check's without the noise of timing two whole runs on a shared machine.
/// </summary>
internal static class TimedKernelSubsample
{
    public static void Run(string samplePath, int features, int limit)
    {
        var columns = Enumerable.Range(0, features).Select(i => $"x{i:00}").ToList();
        var indices = Enumerable.Range(0, features).ToArray();
        var subsample = new KernelSubsample(features, limit);
        var sample = Sample.Open([samplePath]);
        var add = new Stopwatch();
        var process = Process.GetCurrentProcess();
        var cpu = TimeSpan.Zero;
        long events = 0;
        var hash = new Stopwatch();
        var hashes = new ulong[256];
        var least = ulong.MaxValue;
        foreach (var batch in sample.ReadBatches(columns))
        {
            var view = new FeatureView(Enumerable.Range(0, features).Select(batch.ColumnBuffer).ToArray(), [], weighted: false,
                new long[batch.RowCount]) { Rows = batch.RowCount };
            // The row hash alone over the batch first (bringing it into the cache, as the
            // joint moments' pass does before the subsample in a check), for comparison.
            hash.Start();
            for (var start = 0; start < view.Rows; start += 256)
            {
                var h = hashes.AsSpan(0, Math.Min(256, view.Rows - start));
                JointRowHash.Begin(h);
                foreach (var f in indices) JointRowHash.Mix(view.Feature(f).Slice(start, h.Length), h);
                JointRowHash.End(h);
                least = Math.Min(least, h[0]);
            }
            hash.Stop();
            process.Refresh();
            var before = process.TotalProcessorTime;
            add.Start();
            subsample.Add(view, indices);
            add.Stop();
            process.Refresh();
            cpu += process.TotalProcessorTime - before;
            events += batch.RowCount;
        }
        var finish = Stopwatch.StartNew();
        var (_, rows) = subsample.Sums(new double[features], Enumerable.Repeat(1.0, features).ToArray(), JointMoments.Blocks);
        finish.Stop();
        Console.WriteLine(FormattableString.Invariant(
            $"events {events} features {features} K {limit} kept {rows}: add {add.Elapsed.TotalSeconds:F3} s wall, {cpu.TotalSeconds:F3} s process CPU ({cpu.TotalSeconds / events * 1e9:F1} ns a row), final sums {finish.Elapsed.TotalSeconds:F3} s; the hash alone {hash.Elapsed.TotalSeconds:F3} s wall (least {least:x})"));
    }
}
