using System.Globalization;
using System.Text.Json.Nodes;
using GateTasks.Engine.Contracts;
using GateTasks.Engine.Diagnostics;
using GateTasks.Engine.References;
using ParquetSharp;

namespace GateTasks.Engine.Tests.References;

/// <summary>
/// The reference file's histogram rows (docs/reference-format.md, "Rows"): each row says its part (below, bin, above)
/// and only regular bins carry a number, 0 … n − 1. The rows are read back with ParquetSharp 25.0.1.2 (Apache Arrow's
/// C++ Parquet reader), not with the Parquet.Net code that wrote them; files of the retired layout are written with
/// ParquetSharp too. The expectations on refusals are the documented behaviour (docs/error-codes.md, GATE2102).
/// </summary>
public sealed class ReferenceFileRowsTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("gatetasks-rows-").FullName;

    public void Dispose() => Directory.Delete(_dir, recursive: true);

    /// <summary>A reference of one 4-bin feature over x = 0 … 99 (unit weights), 10 values below and 10 above the range.</summary>
    private string BuildReference()
    {
        var contract = ContractLoader.Parse("""
            contract-version: 1
            sample: s.csv
            reference: ref.parquet
            defaults:
              checks: { ks-max: 0.05 }
            features:
              - name: x
                binning: { bins: 4, range: [10, 90] }
            """, Path.Combine(_dir, "precision-contract.yaml"));
        var csv = Path.Combine(_dir, "s.csv");
        File.WriteAllLines(csv, new[] { "x" }.Concat(Enumerable.Range(0, 100).Select(i => i.ToString(CultureInfo.InvariantCulture))));
        var reference = ReferenceBuilder.Build(contract, [csv], null, "test");
        var path = Path.Combine(_dir, "ref.parquet");
        ReferenceFile.Write(path, reference);
        return path;
    }

    private sealed record StoredRows(string[] Names, string[] Parts, int?[] Bins, double[] Lower, double[] Upper, double[] SumW, double[] SumW2,
        IReadOnlyDictionary<string, string> Metadata);

    private static StoredRows ReadWithParquetSharp(string path)
    {
        using var file = new ParquetFileReader(path);
        using var group = file.RowGroup(0);
        var n = checked((int)group.MetaData.NumRows);
        var schema = file.FileMetaData.Schema;
        T[] Column<T>(string name) => group.Column(schema.ColumnIndex(name)).LogicalReader<T>().ReadAll(n);
        var rows = new StoredRows(Column<string>("feature"), Column<string>("part"), Column<int?>("bin"), Column<double>("lower"),
            Column<double>("upper"), Column<double>("sum_w"), Column<double>("sum_w2"), file.FileMetaData.KeyValueMetadata);
        Assert.Equal(-1, schema.ColumnIndex("cell")); // the retired numbering's column is gone
        return rows;
    }

    [Fact]
    public void Rows_say_their_part_and_number_only_the_regular_bins()
    {
        var rows = ReadWithParquetSharp(BuildReference());

        Assert.Equal(["below", "bin", "bin", "bin", "bin", "above"], rows.Parts);
        Assert.Equal([null, 0, 1, 2, 3, null], rows.Bins);
        // Edges 10, 30, 50, 70, 90 from the contract's range; x = 0 … 99 puts 10 values below, 20 in each bin, 10 above.
        Assert.Equal([double.NegativeInfinity, 10, 30, 50, 70, 90], rows.Lower);
        Assert.Equal([10, 30, 50, 70, 90, double.PositiveInfinity], rows.Upper);
        Assert.Equal([10, 20, 20, 20, 20, 10], rows.SumW);
        Assert.Equal("8", rows.Metadata[ReferenceFile.FormatKey]);
    }

    [Fact]
    public void What_is_written_is_read_back_cell_for_cell()
    {
        // Compares the program with itself: writing then reading gives the histogram that was built.
        var path = BuildReference();
        var back = ReferenceFile.Read(path).Find("x")!.Histogram;
        Assert.Equal([10, 30, 50, 70, 90], back.Axis.Edges.ToArray());
        Assert.Equal([10, 20, 20, 20, 20, 10], back.SumW.ToArray());
        Assert.Equal([10, 20, 20, 20, 20, 10], back.SumW2.ToArray());

        // Written again from what was read, the file holds the same rows.
        var again = Path.Combine(_dir, "again.parquet");
        ReferenceFile.Write(again, ReferenceFile.Read(path));
        var first = ReadWithParquetSharp(path);
        var second = ReadWithParquetSharp(again);
        Assert.Equal(first.Parts, second.Parts);
        Assert.Equal(first.Bins, second.Bins);
        Assert.Equal(first.SumW, second.SumW);
    }

    [Fact]
    public void A_version_7_file_numbering_its_flows_as_cells_is_refused_with_the_command_that_rebuilds_it()
    {
        var current = ReadWithParquetSharp(BuildReference());
        var header = JsonNode.Parse(current.Metadata[ReferenceFile.MetadataKey])!.AsObject();
        header["format"] = 7;
        var old = Path.Combine(_dir, "v7.parquet");
        // Version 7's layout: a cell column numbering 0 = underflow, 1 … n = bins, n + 1 = overflow.
        using (var writer = new ParquetFileWriter(old,
            [new Column<string>("feature"), new Column<int>("cell"), new Column<double>("lower"), new Column<double>("upper"),
             new Column<double>("sum_w"), new Column<double>("sum_w2")],
            keyValueMetadata: new Dictionary<string, string> { [ReferenceFile.FormatKey] = "7", [ReferenceFile.MetadataKey] = header.ToJsonString() }))
        {
            using var group = writer.AppendRowGroup();
            using (var c = group.NextColumn().LogicalWriter<string>()) c.WriteBatch(current.Names);
            using (var c = group.NextColumn().LogicalWriter<int>()) c.WriteBatch(Enumerable.Range(0, current.Names.Length).ToArray());
            using (var c = group.NextColumn().LogicalWriter<double>()) c.WriteBatch(current.Lower);
            using (var c = group.NextColumn().LogicalWriter<double>()) c.WriteBatch(current.Upper);
            using (var c = group.NextColumn().LogicalWriter<double>()) c.WriteBatch(current.SumW);
            using (var c = group.NextColumn().LogicalWriter<double>()) c.WriteBatch(current.SumW2);
            writer.Close();
        }

        var e = Assert.Throws<GateInputException>(() => ReferenceFile.Read(old));
        Assert.Equal(ErrorCodes.ReferenceUnreadable, e.Code);
        Assert.Equal(old, e.Location?.File);
        Assert.Contains("reference format 7", e.Message);
        Assert.Contains("rebuild it with 'gatetasks reference build' (format 8)", e.Message);
    }

    /// <summary>Rewrites the reference's rows with <paramref name="edit"/> applied and a checksum that fits them, as a careless tool would.</summary>
    private string Rewritten(Action<string[], int?[]> edit)
    {
        var current = ReadWithParquetSharp(BuildReference());
        var parts = current.Parts.ToArray();
        var bins = current.Bins.ToArray();
        edit(parts, bins);
        var json = current.Metadata[ReferenceFile.MetadataKey];
        var recorded = (string)JsonNode.Parse(json)![ReferenceDigest.Key]!;
        var unsealed = json.Replace(ReferenceDigest.Entry(recorded), ReferenceDigest.Entry(ReferenceDigest.Placeholder), StringComparison.Ordinal);
        using var digest = new ReferenceDigest(unsealed);
        for (var i = 0; i < parts.Length; i++)
            digest.Add(current.Names[i], parts[i], bins[i], current.Lower[i], current.Upper[i], current.SumW[i], current.SumW2[i]);
        var sealedHeader = unsealed.Replace(ReferenceDigest.Entry(ReferenceDigest.Placeholder), ReferenceDigest.Entry(digest.Finish()), StringComparison.Ordinal);
        var path = Path.Combine(_dir, $"edited-{Guid.NewGuid():N}.parquet");
        using var writer = new ParquetFileWriter(path,
            [new Column<string>("feature"), new Column<string>("part"), new Column<int?>("bin"), new Column<double>("lower"), new Column<double>("upper"),
             new Column<double>("sum_w"), new Column<double>("sum_w2")],
            keyValueMetadata: new Dictionary<string, string> { [ReferenceFile.FormatKey] = "8", [ReferenceFile.MetadataKey] = sealedHeader });
        using (var group = writer.AppendRowGroup())
        {
            using (var c = group.NextColumn().LogicalWriter<string>()) c.WriteBatch(current.Names);
            using (var c = group.NextColumn().LogicalWriter<string>()) c.WriteBatch(parts);
            using (var c = group.NextColumn().LogicalWriter<int?>()) c.WriteBatch(bins);
            using (var c = group.NextColumn().LogicalWriter<double>()) c.WriteBatch(current.Lower);
            using (var c = group.NextColumn().LogicalWriter<double>()) c.WriteBatch(current.Upper);
            using (var c = group.NextColumn().LogicalWriter<double>()) c.WriteBatch(current.SumW);
            using (var c = group.NextColumn().LogicalWriter<double>()) c.WriteBatch(current.SumW2);
        }
        writer.Close();
        return path;
    }

    [Fact]
    public void The_unchanged_rows_rewritten_by_another_writer_are_read()
    {
        // The control for the refusals below: the same rewriting with no edit is accepted.
        Assert.Equal([10, 20, 20, 20, 20, 10], ReferenceFile.Read(Rewritten((_, _) => { })).Find("x")!.Histogram.SumW.ToArray());
    }

    [Theory]
    [InlineData("underflow", "a row of part 'underflow'")]      // a part this format does not have
    [InlineData("flow-as-bin", "a bin row without a bin number")]      // a bin row without a number
    [InlineData("numbered-flow", "its above row numbered 4")]
    [InlineData("bin-twice", "bin 1 row twice")]
    public void Rows_whose_part_and_number_do_not_fit_are_refused_at_the_file(string edit, string says)
    {
        var path = Rewritten((parts, bins) =>
        {
            switch (edit)
            {
                case "underflow": parts[0] = "underflow"; break;
                case "flow-as-bin": parts[0] = "bin"; break;
                case "numbered-flow": bins[5] = 4; break;
                case "bin-twice": bins[3] = 1; break;
            }
        });
        var e = Assert.Throws<GateInputException>(() => ReferenceFile.Read(path));
        Assert.Equal(ErrorCodes.ReferenceUnreadable, e.Code);
        Assert.Equal(path, e.Location?.File);
        Assert.Contains(says, e.Message);
    }
}
