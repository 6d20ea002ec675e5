using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace GateTasks.Engine.Samples;

/// <summary>
/// Sorts a batch's rows into the categories of a category block in one pass over the block's values: each category
/// gets, in row order, the rows whose value equals its own (what the condition <c>value == category</c> keeps, so a NaN
/// is in none), however many categories there are.
/// </summary>
internal static class CategoryRows
{
    // Up to this many categories every row is written to every list and only the matching count moves on: no branch
    // on the category, which for mixed categories would be mispredicted at about every row (four lists a pass).
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

    // Four categories a pass (a missing one is NaN, equal to nothing, into a one-row scratch list), their counts held
    // in registers; the lists are long enough for every row (checked), and a count never passes the row number.
    private static void Branchless(ReadOnlySpan<double> codes, ReadOnlySpan<double> categories, int[][] lists, Span<int> counts)
    {
        var scratch = new int[1];
        var g = categories.Length;
        Span<double> four = stackalloc double[4];
        var list = new int[4][];
        for (var from = 0; from < g; from += 4)
        {
            for (var k = 0; k < 4; k++)
            {
                four[k] = from + k < g ? categories[from + k] : double.NaN;
                list[k] = from + k < g ? lists[from + k] : scratch;
            }
            var (n0, n1, n2, n3) = FourAtATime(codes, (four[0], four[1], four[2], four[3]), list[0], list[1], list[2], list[3]);
            int[] found = [n0, n1, n2, n3];
            for (var k = 0; k < 4 && from + k < g; k++) counts[from + k] = found[k];
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static (int, int, int, int) FourAtATime(ReadOnlySpan<double> codes, (double, double, double, double) categories,
        int[] list0, int[] list1, int[] list2, int[] list3)
    {
        var (v0, v1, v2, v3) = categories;
        ref var c0 = ref MemoryMarshal.GetReference(codes);
        ref var l0 = ref MemoryMarshal.GetArrayDataReference(list0);
        ref var l1 = ref MemoryMarshal.GetArrayDataReference(list1);
        ref var l2 = ref MemoryMarshal.GetArrayDataReference(list2);
        ref var l3 = ref MemoryMarshal.GetArrayDataReference(list3);
        int n0 = 0, n1 = 0, n2 = 0, n3 = 0;
        for (var r = 0; r < codes.Length; r++)
        {
            var c = Unsafe.Add(ref c0, r);
            Unsafe.Add(ref l0, n0) = r;
            Unsafe.Add(ref l1, n1) = r;
            Unsafe.Add(ref l2, n2) = r;
            Unsafe.Add(ref l3, n3) = r;
            bool h0 = c == v0, h1 = c == v1, h2 = c == v2, h3 = c == v3;
            n0 += Unsafe.As<bool, byte>(ref h0);
            n1 += Unsafe.As<bool, byte>(ref h1);
            n2 += Unsafe.As<bool, byte>(ref h2);
            n3 += Unsafe.As<bool, byte>(ref h3);
        }
        return (n0, n1, n2, n3);
    }

    /// <summary>
    /// The values at <paramref name="rows"/> (increasing, as <see cref="Sort"/> lists them) into the start of
    /// <paramref name="into"/>, in order.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static void Gather(ReadOnlySpan<float> values, ReadOnlySpan<int> rows, Span<float> into)
    {
        if (rows.IsEmpty) return;
        // Increasing rows: the first and the last bound them all, so each read needs no check of its own.
        if (into.Length < rows.Length || rows[0] < 0 || rows[^1] >= values.Length)
            throw new ArgumentException("The rows are outside the values or more than the output holds.", nameof(rows));
        ref var v0 = ref MemoryMarshal.GetReference(values);
        ref var r0 = ref MemoryMarshal.GetReference(rows);
        ref var o0 = ref MemoryMarshal.GetReference(into);
        for (var k = 0; k < rows.Length; k++) Unsafe.Add(ref o0, k) = Unsafe.Add(ref v0, Unsafe.Add(ref r0, k));
    }
}
