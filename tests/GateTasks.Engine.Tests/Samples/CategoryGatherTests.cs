using System.Globalization;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Samples;

/// <summary>
/// A category block's values without a selection (each condition's rows found once, each category's values gathered
/// in its own visit, as stored floats where it can) against the same values kept by a selection of that category
/// (compacted row by row before the visits). A comparison of the program with itself: every category must receive
/// the same values, in the same order, with the same weights, batch by batch.
/// </summary>
public sealed class CategoryGatherTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-category-gather-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private string WriteSample()
    {
        var random = new Random(20_261_203);
        const int rows = 30_001;
        var x = new float[rows];
        var c = new float[rows];
        var w = new double[rows];
        for (var r = 0; r < rows; r++)
        {
            x[r] = (float)(random.NextDouble() * 4 - 1);
            // Categories 0, 1 and 2, some rows in none (7) and some NaN; x has NaN too.
            c[r] = r % 97 == 0 ? float.NaN : r % 31 == 0 ? 7 : random.Next(3);
            if (r % 113 == 0) x[r] = float.NaN;
            w[r] = 0.5 + random.NextDouble();
        }
        var path = Path.Combine(_dir, "s.parquet");
        // Row groups above and below the size at which features are visited side by side.
        ParquetFixture.Write(path,
            [new ParquetFixtureColumn<float>("x", x, v => v), new ParquetFixtureColumn<float>("c", c, v => v), new ParquetFixtureColumn<double>("w", w, v => v)],
            [20_000, 10_000, 1]);
        return path;
    }

    // Each feature's batches as the visitors receive them: values widened to doubles, then weights (none: unit).
    private static Dictionary<int, List<(double[] Values, double[] Weights, bool AsFloats)>> Stream(string text, string samplePath)
    {
        var contract = ContractLoader.Parse(text, "c.yaml");
        var sample = Sample.Open([samplePath]);
        var inputs = FeatureSources.Compile(contract, ["x", "c", "w"]);
        var seen = new Dictionary<int, List<(double[], double[], bool)>>();
        void Record(int i, double[] values, double[] weights, bool asFloats)
        {
            lock (seen)
            {
                if (!seen.TryGetValue(i, out var list)) seen[i] = list = [];
                list.Add((values, weights, asFloats));
            }
        }
        SampleStream.Run(sample, inputs, contract.Sample.Weight, (i, values, weights) => Record(i, values.ToArray(), weights.ToArray(), false),
            null, null, (i, values) =>
            {
                Record(i, values.ToArray().Select(v => (double)v).ToArray(), [], true);
                return true;
            });
        return seen;
    }

    private static string Contract(bool weighted, string? selection, string feature) => $"""
        contract-version: 1
        sample: {"{"} path: s.parquet{(weighted ? ", weight: w" : "")} {"}"}
        reference: r.parquet
        {(selection is null ? "" : $"selection: \"{selection}\"")}
        defaults:
          checks: {"{"} ks-max: 0.01 {"}"}
        features:
          - name: x
        {feature}
        """;

    [Theory]
    [InlineData(false, "c", "", new[] { 0, 1, 2 })]
    [InlineData(true, "c", "", new[] { 0, 1, 2 })]
    // By an expression, with the fractions (a feature whose expression is the block's by: its values are taken), the
    // categories out of order and one (5) no row has.
    [InlineData(false, "min(c * 2, 3)", ", fraction-max: 0.01", new[] { 2, 0, 5, 3 })]
    [InlineData(true, "min(c * 2, 3)", ", fraction-max: 0.01", new[] { 2, 0, 5, 3 })]
    public void Each_category_receives_the_values_a_selection_of_it_keeps(bool weighted, string by, string fractions, int[] values)
    {
        var path = WriteSample();
        var block = Stream(Contract(weighted, null, $"    categories: {{ by: \"{by}\", values: [{string.Join(", ", values)}]{fractions} }}"), path);
        for (var v = 0; v < values.Length; v++)
        {
            var selected = Stream(Contract(weighted, string.Create(CultureInfo.InvariantCulture, $"{by} == {values[v]}"), ""), path).GetValueOrDefault(0, []);
            // Features: x, then one per category in the order listed (then the fractions).
            var category = block.GetValueOrDefault(1 + v, []);
            Assert.Equal(selected.Count, category.Count);
            for (var b = 0; b < selected.Count; b++)
            {
                Assert.Equal(selected[b].Values, category[b].Values);
                Assert.Equal(selected[b].Weights, category[b].Weights);
            }
            // Unit weights: the category's float32 values reach the visitor as stored.
            Assert.All(category, batch => Assert.Equal(!weighted, batch.AsFloats));
        }
    }
}
