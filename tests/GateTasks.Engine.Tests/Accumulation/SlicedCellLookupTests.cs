using GateTasks.Engine.Accumulation;

namespace GateTasks.Engine.Tests.Accumulation;

/// <summary>The table-assisted cell search against a plain binary search (Array.BinarySearch, the .NET base library).</summary>
public sealed class SlicedCellLookupTests
{
    [Fact]
    public void Cells_match_a_binary_search_on_uneven_edges()
    {
        var rng = new Random(3);
        // Dense in the middle, sparse in the tails, as an equal-probability grid of a long-tailed projection is.
        var edges = Enumerable.Range(0, 300).Select(i => Math.Sinh((i - 150) / 30.0)).ToArray();
        var lookup = new SlicedCellLookup(edges);
        var probes = Enumerable.Range(0, 20_000).Select(_ => Math.Sinh((rng.NextDouble() - 0.5) * 12)).Concat(edges)
            .Concat(edges.Select(Math.BitDecrement)).Concat(edges.Select(Math.BitIncrement)).ToArray();
        foreach (var x in probes)
        {
            // Array.BinarySearch: the index of x, or the bitwise complement of the first larger edge; cell c holds
            // edges[c − 1] ≤ x < edges[c], so an exact hit at edge i is cell i + 1.
            var i = Array.BinarySearch(edges, x);
            var expected = i >= 0 ? i + 1 : ~i;
            Assert.Equal(expected, lookup.Cell(x));
        }
    }

    private static void AssertBinarySearch(double[] edges, IEnumerable<double> probes)
    {
        var lookup = new SlicedCellLookup(edges);
        var values = probes.Concat(edges).Concat(edges.Select(Math.BitDecrement)).Concat(edges.Select(Math.BitIncrement)).Where(double.IsFinite).ToArray();
        var cells = new int[values.Length];
        lookup.CellsOf(values, cells);
        for (var k = 0; k < values.Length; k++)
        {
            // Array.BinarySearch (the .NET base library): an exact hit at edge i is cell i + 1, a miss the complement
            // of the first larger edge.
            var i = Array.BinarySearch(edges, values[k]);
            Assert.Equal(i >= 0 ? i + 1 : ~i, lookup.Cell(values[k]));
            Assert.Equal(i >= 0 ? i + 1 : ~i, cells[k]);
        }
    }

    [Fact]
    public void Cells_match_a_binary_search_on_random_and_adversarial_edges()
    {
        var rng = new Random(17);
        double Normal() => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
        var grids = new List<double[]>
        {
            // Normal quantiles with a very long tail each side (the outermost edges 10^6 and 10^12 away).
            Enumerable.Range(0, 500).Select(_ => Normal()).Append(-1e6).Append(1e12).Distinct().Order().ToArray(),
            // Random edges, few and many.
            Enumerable.Range(0, 3).Select(_ => rng.NextDouble()).Distinct().Order().ToArray(),
            Enumerable.Range(0, 2_000).Select(_ => rng.NextDouble() * 100 - 50).Distinct().Order().ToArray(),
            // Two edges only; and the widest finite range.
            new double[] { -1, 1 },
            new double[] { -double.MaxValue, 0, double.MaxValue },
            // Subnormal spacing: a cluster of edges one ulp apart around 0 and around 1, in a wide grid.
            Enumerable.Range(-40, 81).Select(i => i * double.Epsilon).Concat(Enumerable.Range(0, 40).Select(i => 1 + i * 2.220446049250313e-16))
                .Concat(Enumerable.Range(1, 200).Select(i => Math.Pow(1.2, i))).Concat(Enumerable.Range(1, 200).Select(i => -Math.Pow(1.2, i))).Distinct().Order().ToArray(),
            // Geometric edges: every slot of a uniform table but the last would be empty.
            Enumerable.Range(0, 300).Select(i => Math.Pow(2, i - 100)).ToArray(),
        };
        foreach (var edges in grids)
        {
            var lo = edges[0];
            var hi = edges[^1];
            var probes = Enumerable.Range(0, 20_000).Select(_ => rng.Next(4) switch
            {
                0 => edges[rng.Next(edges.Length)],                               // exactly on an edge
                1 => lo + (hi - lo) * rng.NextDouble(),                           // anywhere in the range
                2 => Normal() * Math.Pow(10, rng.Next(-300, 300)),                // any scale, either sign
                _ => edges[rng.Next(edges.Length)] * (1 + (rng.NextDouble() - 0.5) * 1e-12), // just beside an edge
            }).Append(lo - 1).Append(hi + 1).Append(double.MaxValue).Append(-double.MaxValue).Append(0.0).Append(-0.0)
              .Append(double.Epsilon).Append(-double.Epsilon);
            AssertBinarySearch(edges, probes);
        }
    }
}
