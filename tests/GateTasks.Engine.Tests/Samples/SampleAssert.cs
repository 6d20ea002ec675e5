using GateTasks.Engine.Samples;

namespace GateTasks.Engine.Tests.Samples;

/// <summary>Reading helpers and exact comparisons for sample tests.</summary>
internal static class SampleAssert
{
    /// <summary>Reads all batches, copying each (the reader may reuse its buffers), with the rows of each batch.</summary>
    public static (double[][] Columns, List<int> BatchRows) ReadAll(IEnumerable<SampleBatch> batches, int columnCount)
    {
        var columns = Enumerable.Range(0, columnCount).Select(_ => new List<double>()).ToArray();
        var batchRows = new List<int>();
        foreach (var batch in batches)
        {
            Assert.Equal(columnCount, batch.ColumnCount);
            batchRows.Add(batch.RowCount);
            for (var c = 0; c < columnCount; c++) columns[c].AddRange(batch.Column(c).ToArray());
        }
        return (columns.Select(c => c.ToArray()).ToArray(), batchRows);
    }

    /// <summary>
    /// Every value equal bit for bit (so -0.0 differs from 0.0), except that any NaN equals any NaN:
    /// the engine's NaN for a null need not carry the payload of a written NaN.
    /// </summary>
    public static void Identical(IReadOnlyList<double> expected, IReadOnlyList<double> actual, string column)
    {
        Assert.Equal(expected.Count, actual.Count);
        for (var i = 0; i < expected.Count; i++)
        {
            var same = double.IsNaN(expected[i])
                ? double.IsNaN(actual[i])
                : BitConverter.DoubleToInt64Bits(expected[i]) == BitConverter.DoubleToInt64Bits(actual[i]);
            Assert.True(same, $"column {column}, row {i}: expected {expected[i]:R}, read {actual[i]:R}");
        }
    }
}
