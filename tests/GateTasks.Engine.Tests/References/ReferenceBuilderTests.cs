using System.Globalization;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;

namespace GateTasks.Engine.Tests.References;

public sealed class ReferenceBuilderTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-ref-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private PrecisionContract Contract(string features) =>
        ContractLoader.Parse($"""
            contract-version: 1
            sample: s.csv
            reference: ref.parquet
            defaults:
              checks: {"{"} ks-max: 0.05 {"}"}
            features:
            {features}
            """, Path.Combine(_dir, "precision-contract.yaml"));

    private string Csv(int rows, Func<int, string> row, string header)
    {
        var path = Path.Combine(_dir, $"s{Guid.NewGuid():N}.csv");
        File.WriteAllLines(path, new[] { header }.Concat(Enumerable.Range(0, rows).Select(row)));
        return path;
    }

    [Fact]
    public void Builds_quantile_uniform_and_discrete_features_and_round_trips_through_the_file()
    {
        var contract = Contract("""
              - name: x
                binning: { bins: 10 }
              - name: u
                column: x
                binning: { bins: 5, range: [0, 500] }
              - name: k
                kind: discrete
            """);
        // x = 0..999 (one NaN every 100th row replaces nothing: it is an extra row), k = i mod 4.
        var csv = Csv(1000, i => string.Create(CultureInfo.InvariantCulture, $"{i},{i % 4},1"), "x,k,w");
        var r = ReferenceBuilder.Build(contract, [csv], "w", "test");
        Assert.Equal(1000, r.Events);

        var x = r.Find("x")!;
        Assert.Equal(10, x.Histogram.Axis.Count);
        for (var b = 1; b <= 10; b++) Assert.InRange(x.Histogram.SumW[b], 99, 101); // equal-probability
        // Population mean and standard deviation of 0..999, exact: 499.5 and sqrt((1000²−1)/12).
        Assert.Equal(499.5, x.Summary.Mean, 9);
        Assert.Equal(Math.Sqrt((1000.0 * 1000 - 1) / 12), x.Summary.StandardDeviation, 9);
        Assert.InRange(x.Quantile(0.5)!.Value, 498, 501);

        var u = r.Find("u")!;
        Assert.Equal([0, 100, 100, 100, 100, 100, 500], u.Histogram.SumW.ToArray());

        var k = r.Find("k")!;
        Assert.Equal(4, k.Histogram.Axis.Count);
        Assert.Equal(-0.5, k.Histogram.Axis.Edges[0]);
        Assert.Equal([0, 250, 250, 250, 250, 0], k.Histogram.SumW.ToArray());

        var file = Path.Combine(_dir, "ref.parquet");
        ReferenceFile.Write(file, r);
        var back = ReferenceFile.Read(file);
        Assert.Equal(r.Events, back.Events);
        Assert.Equal(r.Inputs, back.Inputs);
        foreach (var f in r.Features)
        {
            var g = back.Find(f.Name)!;
            Assert.Equal(f.Histogram.Axis.Edges.ToArray(), g.Histogram.Axis.Edges.ToArray());
            Assert.Equal(f.Histogram.SumW.ToArray(), g.Histogram.SumW.ToArray());
            Assert.Equal(f.Histogram.SumW2.ToArray(), g.Histogram.SumW2.ToArray());
            Assert.Equal(f.Summary, g.Summary);
            Assert.Equal(f.Quantiles, g.Quantiles);
            Assert.Equal(f.BinningRequest, g.BinningRequest);
        }
        Assert.Equal(64, back.Inputs[0].Sha256.Length);
    }

    [Fact]
    public void NaN_values_are_counted_apart_and_an_all_NaN_feature_is_refused()
    {
        var contract = Contract("  - name: x\n");
        var csv = Csv(10, i => i % 5 == 0 ? "nan" : i.ToString(CultureInfo.InvariantCulture), "x");
        var r = ReferenceBuilder.Build(contract, [csv], null, "test");
        Assert.Equal(2, r.Find("x")!.Histogram.NanEntries);
        Assert.Equal(8, r.Find("x")!.Summary.Count);

        var allNan = Csv(3, _ => "nan", "x");
        var e = Assert.Throws<GateInputException>(() => ReferenceBuilder.Build(contract, [allNan], null, "test"));
        Assert.Equal(ErrorCodes.SampleEmpty, e.Code);
    }

    [Theory]
    [InlineData("inf", "holds infinite values")]
    [InlineData("1.5e308", "a range wider than a double can hold")]
    [InlineData("3e307", "overflows a double")]
    public void Extreme_or_infinite_reference_values_are_refused_at_the_column_not_crashed_on(string extreme, string says)
    {
        // Alternating signs: the range, or the sum of squares, passes the largest double (1.8e308, IEEE 754).
        var contract = Contract("  - name: x\n");
        var csv = Csv(40, i => (i % 2 == 0 ? "" : "-") + (i < 4 ? extreme : (i * 0.1).ToString(CultureInfo.InvariantCulture)), "x");
        var e = Assert.Throws<GateInputException>(() => ReferenceBuilder.Build(contract, [csv], null, "test"));
        Assert.Equal(ErrorCodes.SampleColumnType, e.Code);
        Assert.Contains(says, e.Message);
        Assert.Equal(contract.Features[0].ColumnLocation, e.Location);
    }

    [Fact]
    public void Large_but_representable_values_build_a_reference_with_finite_edges()
    {
        var contract = Contract("  - name: x\n");
        var csv = Csv(2_000, i => ((i - 1000) * 1e140).ToString("R", CultureInfo.InvariantCulture), "x");
        var r = ReferenceBuilder.Build(contract, [csv], null, "test");
        var h = r.Find("x")!.Histogram;
        Assert.All(h.Axis.Edges.ToArray(), e => Assert.True(double.IsFinite(e)));
        Assert.Equal(2_000, h.TotalSumW);
    }

    [Fact]
    public void A_file_that_is_not_a_reference_is_refused_with_its_name()
    {
        var notReference = Csv(2, i => "1", "x");
        var e = Assert.Throws<GateInputException>(() => ReferenceFile.Read(notReference));
        Assert.Equal(ErrorCodes.ReferenceUnreadable, e.Code);
        Assert.Contains(Path.GetFileName(notReference), e.Message);
        Assert.Equal(ErrorCodes.ReferenceNotFound, Assert.Throws<GateInputException>(() => ReferenceFile.Read(notReference + ".none")).Code);
    }
}
