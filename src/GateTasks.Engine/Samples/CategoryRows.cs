namespace GateTasks.Engine.Samples;

/// <summary>
/// Sorts a batch's rows into the categories of a category block in one pass over the block's values: each category
/// gets, in row order, the rows whose value equals its own (what the condition <c>value == category</c> keeps, so a NaN
/// is in none), however many categories there are.
/// </summary>
internal static class CategoryRows
{
    // Up to this many categories every row is written to every list and only the matching count moves on: no branch
    // on the category, which for mixed categories would be mispredicted at about every row.
    private const int WrittenToEvery = 8;

    /// <summary>
    /// Rows of <paramref name="codes"/> into <paramref name="lists"/>[k] where the code equals
    /// <paramref name="categories"/>[k] (distinct values), in order; how many into <paramref name="counts"/>[k].
    /// </summary>
    public static void Sort(ReadOnlySpan<double> codes, ReadOnlySpan<double> categories, int[][] lists, Span<int> counts)
    {
        if (lists.Length != categories.Length || counts.Length != categories.Length)
            throw new ArgumentException("One list and one count per category.", nameof(lists));
        foreach (var list in lists)
            if (list.Length < codes.Length) throw new ArgumentException("A list is shorter than the rows.", nameof(lists));
        counts.Clear();
        if (categories.Length <= WrittenToEvery) Branchless(codes, categories, lists, counts);
        else
            for (var r = 0; r < codes.Length; r++)
            {
                var c = codes[r];
                for (var k = 0; k < categories.Length; k++)
                {
                    if (c != categories[k]) continue;
                    lists[k][counts[k]++] = r;
                    break;
                }
            }
    }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveOptimization)]
    private static void Branchless(ReadOnlySpan<double> codes, ReadOnlySpan<double> categories, int[][] lists, Span<int> counts)
    {
        var g = categories.Length;
        for (var r = 0; r < codes.Length; r++)
        {
            var c = codes[r];
            for (var k = 0; k < g; k++)
            {
                lists[k][counts[k]] = r;
                var holds = c == categories[k];
                counts[k] += System.Runtime.CompilerServices.Unsafe.As<bool, byte>(ref holds);
            }
        }
    }
}
