using System.Text.Json;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Samples;

/// <summary>
/// The one-pass sorting of a batch's rows into the categories of a block against numpy: for each category v,
/// numpy.flatnonzero(codes == v) and numpy.bincount of the categories' positions, with Debian's numpy 1.24 on Python
/// 3.11, frozen into tests/fixtures/numpy/category_rows.json by tests/fixtures/numpy/make_category_rows_fixtures.py
/// (min(floor(x * 4), 3) with NaN, -0.0 and codes in no category; twelve categories out of order, past the branch-free
/// sort, and six of them, two passes of four; categories that are not whole numbers with codes one ulp off each).
/// </summary>
public class CategoryRowsTests
{
    public static TheoryData<string> Cases() => new(Fixture().RootElement.GetProperty("cases").EnumerateArray().Select(c => c.GetProperty("name").GetString()!));

    private static JsonDocument Fixture() =>
        JsonDocument.Parse(File.ReadAllText(Path.Combine(AppContext.BaseDirectory, "fixtures", "numpy", "category_rows.json")));

    private static (double[] Codes, double[] Categories, int[][] Rows, int[] Counts) Case(string name)
    {
        var c = Fixture().RootElement.GetProperty("cases").EnumerateArray().Single(x => x.GetProperty("name").GetString() == name);
        return (c.GetProperty("codes").EnumerateArray().Select(e => e.ValueKind == JsonValueKind.Null ? double.NaN : e.GetDouble()).ToArray(),
            c.GetProperty("categories").EnumerateArray().Select(e => e.GetDouble()).ToArray(),
            c.GetProperty("rows").EnumerateArray().Select(r => r.EnumerateArray().Select(e => e.GetInt32()).ToArray()).ToArray(),
            c.GetProperty("counts").EnumerateArray().Select(e => e.GetInt32()).ToArray());
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Each_category_gets_the_rows_numpy_finds_equal_to_it(string name)
    {
        var (codes, categories, rows, counts) = Case(name);
        // Lists longer than the rows (a buffer kept from a larger batch), filled with a marker first.
        var lists = categories.Select(_ => Enumerable.Repeat(-7, codes.Length + 3).ToArray()).ToArray();
        var found = new int[categories.Length];
        CategoryRows.Sort(codes, categories, lists, found);
        Assert.Equal(counts, found);
        for (var k = 0; k < categories.Length; k++)
            Assert.True(rows[k].SequenceEqual(lists[k].Take(found[k])), $"{name}: category {categories[k]:R}: rows differ from numpy.flatnonzero");
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Gathering_at_numpy_s_rows_gives_each_category_its_own_value(string name)
    {
        // The codes as float32 (every fixture code is a float, or NaN) gathered at numpy.flatnonzero(codes == v).
        var (codes, categories, rows, _) = Case(name);
        var floats = codes.Select(c => (float)c).ToArray();
        for (var k = 0; k < categories.Length; k++)
        {
            var into = new float[rows[k].Length + 2];
            CategoryRows.Gather(floats, rows[k], into);
            Assert.All(into.Take(rows[k].Length), v => Assert.Equal((float)categories[k], v));
            Assert.Equal(rows[k].Select(r => floats[r]), into.Take(rows[k].Length));
        }
        if (rows.FirstOrDefault(r => r.Length > 0) is { } some)
            Assert.Throws<ArgumentException>(() => CategoryRows.Gather(floats.AsSpan(0, some[^1]), some, new float[some.Length]));
    }

    [Fact]
    public void A_list_shorter_than_the_rows_is_refused()
    {
        // By the method's contract (each list must hold every row), not from numpy.
        var (codes, categories, _, _) = Case("floor_quarter_four");
        var lists = categories.Select(_ => new int[codes.Length]).ToArray();
        lists[2] = new int[codes.Length - 1];
        Assert.Throws<ArgumentException>(() => CategoryRows.Sort(codes, categories, lists, new int[categories.Length]));
    }
}
