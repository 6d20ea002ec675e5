using GateTasks.Engine.Statistics;

namespace GateTasks.Engine.Tests.Statistics;

public class ReservoirSampleTests
{
    [Fact]
    public void EveryRowIsKeptWithProbabilityCapacityOverN()
    {
        // Vitter (1985), Algorithm R: each of n offered rows ends in the reservoir with probability k/n.
        const int n = 60, k = 12, runs = 4000;
        var kept = new int[n];
        for (int seed = 0; seed < runs; seed++)
        {
            var reservoir = new ReservoirSample(k, 1, seed);
            for (int i = 0; i < n; i++) reservoir.Add(new double[] { i });
            foreach (double[] row in reservoir.Rows) kept[(int)row[0]]++;
        }
        double p = (double)k / n, mean = runs * p, sd = Math.Sqrt(runs * p * (1 - p));
        for (int i = 0; i < n; i++)
            Assert.InRange(kept[i], mean - 5 * sd, mean + 5 * sd);
        Assert.Equal(runs * k, kept.Sum());
    }

    [Fact]
    public void KeepsDistinctRowsUpToCapacity()
    {
        var reservoir = new ReservoirSample(100, 2, 3);
        for (int i = 0; i < 10_000; i++) reservoir.Add(new double[] { i, -i });
        double[][] rows = reservoir.Rows;
        Assert.Equal(100, rows.Length);
        Assert.Equal(10_000, reservoir.Seen);
        Assert.Equal(100, rows.Select(r => r[0]).Distinct().Count());
        Assert.All(rows, r => Assert.Equal(-r[0], r[1]));
    }

    [Fact]
    public void ShortStreamIsKeptWhole()
    {
        var reservoir = new ReservoirSample(10, 1, 1);
        for (int i = 0; i < 4; i++) reservoir.Add(new double[] { i });
        Assert.Equal(new[] { 0.0, 1, 2, 3 }, reservoir.Rows.Select(r => r[0]));
    }

    [Fact]
    public void SameSeedAndOrderGiveTheSameRowsWhateverTheBatching()
    {
        double[] a = Enumerable.Range(0, 5000).Select(i => (double)i).ToArray();
        double[] b = a.Select(v => v * 0.5).ToArray();

        var perRow = new ReservoirSample(50, 2, 42);
        for (int i = 0; i < a.Length; i++) perRow.Add(new[] { a[i], b[i] });

        var batched = new ReservoirSample(50, 2, 42);
        for (int start = 0; start < a.Length; start += 777)
        {
            int rows = Math.Min(777, a.Length - start);
            batched.Add(new[] { a.AsSpan(start).ToArray(), b.AsSpan(start).ToArray() }, rows);
        }

        var again = new ReservoirSample(50, 2, 42);
        again.Add(new[] { a, b }, a.Length);

        Assert.Equal(perRow.Rows, batched.Rows);
        Assert.Equal(perRow.Rows, again.Rows);

        var otherSeed = new ReservoirSample(50, 2, 43);
        otherSeed.Add(new[] { a, b }, a.Length);
        Assert.NotEqual(perRow.Rows.Select(r => r[0]), otherSeed.Rows.Select(r => r[0]));
    }

    [Fact]
    public void WrongShapesAreRejected()
    {
        var reservoir = new ReservoirSample(5, 2, 1);
        Assert.Throws<ArgumentException>(() => reservoir.Add(new double[] { 1, 2, 3 }));
        Assert.Throws<ArgumentException>(() => reservoir.Add(new[] { new double[3] }, 3));
        Assert.Throws<ArgumentException>(() => reservoir.Add(new[] { new double[3], new double[2] }, 3));
        Assert.Throws<ArgumentOutOfRangeException>(() => new ReservoirSample(0, 2, 1));
    }
}
