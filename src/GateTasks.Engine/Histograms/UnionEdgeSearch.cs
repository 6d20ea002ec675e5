namespace GateTasks.Engine.Histograms;

/// <summary>
/// The cells of float32 values on two axes at once, with one search: over the union of both axes' float edges. Each
/// double edge is taken as <see cref="EdgeCountSearch.Float32Edges"/> rounds it (the least float at or above it, so a
/// float value is at or above the float edge exactly when it is at or above the double), and equal float edges are
/// kept once, with how many edges of each axis they stand for. A value's union cell is the count of union edges at or
/// below it; the count of one axis's edges at or below it — that axis's storage cell, as its own search gives it — is
/// then the sum of that axis's multiplicities over those union edges, read from a table. Searching a long axis costs
/// about the same with a few dozen more edges, so a short axis's search is saved whole.
/// </summary>
internal sealed class UnionEdgeSearch
{
    private readonly BlockEdgeCountSearch _search;

    /// <summary>
    /// A search over the union of <paramref name="first"/>'s and <paramref name="second"/>'s edges (each increasing);
    /// <paramref name="guided"/> as for <see cref="BlockEdgeCountSearch"/>.
    /// </summary>
    public UnionEdgeSearch(ReadOnlySpan<double> first, ReadOnlySpan<double> second, bool guided = true)
    {
        var a = EdgeCountSearch.Float32Edges(first);
        var b = EdgeCountSearch.Float32Edges(second);
        var union = new List<float>(a.Length + b.Length);
        var inFirst = new List<int>(a.Length + b.Length);
        var inSecond = new List<int>(a.Length + b.Length);
        for (int i = 0, j = 0; i < a.Length || j < b.Length;)
        {
            var f = j == b.Length || (i < a.Length && a[i] <= b[j]) ? a[i] : b[j];
            var (m, n) = (0, 0);
            while (i < a.Length && a[i] == f) { i++; m++; }
            while (j < b.Length && b[j] == f) { j++; n++; }
            union.Add(f);
            inFirst.Add(m);
            inSecond.Add(n);
        }
        // Float edges are exact doubles, which the search rounds to themselves.
        _search = new BlockEdgeCountSearch(union.Select(f => (double)f).ToArray(), guided);
        CellCount = union.Count + 1;
        FirstCells = new int[CellCount];
        SecondCells = new int[CellCount];
        for (var u = 1; u < CellCount; u++)
        {
            FirstCells[u] = FirstCells[u - 1] + inFirst[u - 1];
            SecondCells[u] = SecondCells[u - 1] + inSecond[u - 1];
        }
    }

    /// <summary>Whether this machine can run the search (else callers search each axis on its own).</summary>
    public static bool IsSupported => BlockEdgeCountSearch.IsSupported;

    /// <summary>Union cells: the union edges' count plus one.</summary>
    public int CellCount { get; }

    /// <summary>For each union cell, the first axis's storage cell (0 below its first edge, its edge count at or above the last).</summary>
    public int[] FirstCells { get; }

    /// <summary>For each union cell, the second axis's storage cell.</summary>
    public int[] SecondCells { get; }

    /// <summary>The union cell of every value; for values that are not NaN (NaN gets <see cref="CellCount"/>).</summary>
    public void Cells(ReadOnlySpan<float> values, Span<int> cells) => _search.Cells(values, cells, CellCount);
}
