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
}
