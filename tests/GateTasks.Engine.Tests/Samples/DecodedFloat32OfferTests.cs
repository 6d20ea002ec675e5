using System.Collections.Concurrent;
using GateTasks.Engine.Samples;
using GateTasks.Engine.Samples.Parquet;

namespace GateTasks.Engine.Tests.Samples;

/// <summary>
/// Float32 columns offered as they are decoded (<see cref="DecodedFloat32Slice"/>) against the batches handed out
/// afterwards: the program compared with itself. The file is written by ParquetSharp 25.0.1.2 (the independent writer
/// of <see cref="ParquetFixture"/>); every value offered must be the value written.
/// </summary>
public sealed class DecodedFloat32OfferTests : IDisposable
{
    // Two row groups of more than one slice each, and a last group of one row.
    private static readonly int[] RowGroups = [ParquetSampleReader.SliceRows + 1_000, 2 * ParquetSampleReader.SliceRows, 1];
    private readonly TemporaryFolder _folder = new();

    public void Dispose() => _folder.Dispose();

    private string Write(out float[] values)
    {
        var rows = RowGroups.Sum();
        var random = new Random(20261203);
        var f32 = Enumerable.Range(0, rows).Select(_ => (float)(random.NextDouble() * 10 - 5)).ToArray();
        var f64 = Enumerable.Range(0, rows).Select(_ => random.NextDouble()).ToArray();
        var withNull = f32.Select((v, i) => i % 1000 == 7 || i == rows - 1 ? (float?)null : v).ToArray(); // a null in every row group
        var path = _folder.File("offer.parquet");
        ParquetFixture.Write(path,
        [
            new ParquetFixtureColumn<float>("a", f32, v => v),
            new ParquetFixtureColumn<double>("b", f64, v => v),
            new ParquetFixtureColumn<float?>("c", withNull, v => v ?? double.NaN),
        ], RowGroups);
        values = f32;
        return path;
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    public void Each_slice_of_a_float32_column_is_offered_once_in_order_and_the_batch_says_it_was_taken(int threads)
    {
        var path = Write(out var written);
        var offered = new ConcurrentDictionary<int, List<float[]>>();
        using var reader = ParquetSampleReader.Open(path);
        var batches = new List<(float[] A, bool TakenA, bool TakenB, bool TakenC)>();
        foreach (var batch in reader.ReadBatches(["a", "b", "c"], threads, (column, values) =>
                 {
                     offered.GetOrAdd(column, _ => []).Add(values.ToArray());
                     return column == 0;
                 }))
            batches.Add((batch.Float32Column(0).ToArray(), batch.TakenOnDecoding(0), batch.TakenOnDecoding(1), batch.TakenOnDecoding(2)));

        // Only the float32 column without nulls is offered (b is float64; c holds a null in every row group).
        Assert.Equal([0], offered.Keys.Order());
        var slices = offered[0];
        Assert.Equal(batches.Count, slices.Count);
        for (var s = 0; s < slices.Count; s++)
        {
            Assert.Equal(batches[s].A, slices[s]); // the batch's values are the ones offered for it
            Assert.True(batches[s].TakenA);
            Assert.False(batches[s].TakenB);
            Assert.False(batches[s].TakenC);
        }
        Assert.Equal(written, slices.SelectMany(s => s).ToArray()); // every value once, in file order, as written
    }

    [Fact]
    public void A_declined_offer_leaves_the_batch_untaken()
    {
        var path = Write(out _);
        using var reader = ParquetSampleReader.Open(path);
        foreach (var batch in reader.ReadBatches(["a"], 2, (_, _) => false))
            Assert.False(batch.TakenOnDecoding(0));
    }

    [Fact]
    public void A_failure_of_what_the_values_were_offered_to_is_passed_on_as_it_is_not_blamed_on_the_file()
    {
        var path = Write(out _);
        using var reader = ParquetSampleReader.Open(path);
        var failure = Assert.Throws<InvalidOperationException>(() =>
        {
            foreach (var _ in reader.ReadBatches(["a", "b"], 2, (_, _) => throw new InvalidOperationException("offer failed"))) { }
        });
        Assert.Equal("offer failed", failure.Message);
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    public void Columns_whose_buffers_are_passed_on_once_taken_still_offer_every_value_as_written(int threads)
    {
        // Four float32 columns, three of them marked as never read again once taken: a thread hands such a column's
        // buffer to the next it decodes (a larger row group than the last outgrows it). The fourth, not marked, is
        // read from the batches afterwards and must not have lent its buffer to the others.
        var rows = RowGroups.Sum();
        var random = new Random(20261204);
        var columns = Enumerable.Range(0, 4).Select(_ => Enumerable.Range(0, rows).Select(_ => (float)(random.NextDouble() * 10 - 5)).ToArray()).ToArray();
        var path = _folder.File("lent.parquet");
        ParquetFixture.Write(path, columns.Select((v, c) => (ParquetFixtureColumn)new ParquetFixtureColumn<float>("f" + c, v, x => x)).ToArray(), RowGroups);
        var offered = new ConcurrentDictionary<int, List<float[]>>();
        var readAfterwards = new List<float>();
        var takenButReadable = new List<float>();
        using var reader = ParquetSampleReader.Open(path);
        foreach (var batch in reader.ReadBatches(["f0", "f1", "f2", "f3"], threads, (column, values) =>
                 {
                     offered.GetOrAdd(column, _ => []).Add(values.ToArray());
                     return column != 3;
                 }, [true, true, false, true]))
        {
            Assert.True(batch.TakenOnDecoding(0) && batch.TakenOnDecoding(1) && batch.TakenOnDecoding(2) && !batch.TakenOnDecoding(3));
            readAfterwards.AddRange(batch.Float32Column(3).ToArray());
            takenButReadable.AddRange(batch.Float32Column(2).ToArray()); // not marked: still readable after it was taken
        }
        for (var c = 0; c < 3; c++) Assert.Equal(columns[c], offered[c].SelectMany(s => s).ToArray()); // every value once, in file order
        Assert.Equal(columns[3], readAfterwards.ToArray());
        Assert.Equal(columns[2], takenButReadable.ToArray());
    }
}
