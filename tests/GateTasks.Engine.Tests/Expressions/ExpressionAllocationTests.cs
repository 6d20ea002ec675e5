using GateTasks.Engine.Expressions;

namespace GateTasks.Engine.Tests.Expressions;

public class ExpressionAllocationTests
{
    [Fact]
    public void A_second_batch_of_the_same_size_allocates_nothing()
    {
        // An allocation test, not a timing test: the scratch buffers grow once and are then reused.
        const int rows = 100_000;
        var compiled = ExpressionCompiler.Compile(
            "if(pt1 > 0 && pt2 > 0, sqrt(2*pt1*pt2*(cosh(eta1-eta2) - cos(phi1-phi2))), -1) + max(pt1, pt2, 0) % 7",
            ["pt1", "eta1", "phi1", "pt2", "eta2", "phi2"], ExpressionRun.Start);
        var random = new Random(7);
        var columns = compiled.Columns.Select(_ => Enumerable.Range(0, rows).Select(_ => random.NextDouble() * 100 - 20).ToArray()).ToArray();
        var output = new double[rows];

        compiled.Evaluate(columns, rows, output);
        // The fewest bytes over a few calls: the runtime may allocate once on the calling thread while it
        // recompiles a hot loop (on-stack replacement, tier-up), which this thread's counter also sees.
        // Buffers made anew on each call would be 800 kB on every one of them.
        var allocated = FewestBytesAllocated(() => compiled.Evaluate(columns, rows, output));
        Assert.True(allocated < 1024, $"second evaluation allocated {allocated} bytes");
        // A smaller batch reuses the larger buffers.
        allocated = FewestBytesAllocated(() => compiled.Evaluate(columns, rows / 3, output));
        Assert.True(allocated < 1024, $"a smaller batch allocated {allocated} bytes");
    }

    private static long FewestBytesAllocated(Action run)
    {
        var fewest = long.MaxValue;
        for (var repeat = 0; repeat < 5; repeat++)
        {
            var before = GC.GetAllocatedBytesForCurrentThread();
            run();
            fewest = Math.Min(fewest, GC.GetAllocatedBytesForCurrentThread() - before);
        }
        return fewest;
    }
}
