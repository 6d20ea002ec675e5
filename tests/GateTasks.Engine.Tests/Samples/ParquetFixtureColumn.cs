using ParquetSharp;

namespace GateTasks.Engine.Tests.Samples;

/// <summary>
/// One column of a Parquet fixture written with ParquetSharp (Apache Arrow's C++ Parquet writer), the
/// independent writer the engine's Parquet.Net-based reader is checked against.
/// </summary>
internal abstract class ParquetFixtureColumn(string name)
{
    public string Name { get; } = name;

    public abstract Column Schema { get; }

    public abstract int Length { get; }

    /// <summary>Writes rows [start, start + count) into the next column of <paramref name="rowGroup"/>.</summary>
    public abstract void Write(RowGroupWriter rowGroup, int start, int count);

    /// <summary>The value the engine must return for <paramref name="row"/>: the written value as a double, null as NaN.</summary>
    public abstract double Expected(int row);
}

/// <summary>A fixture column of element type <typeparamref name="T"/> (nullable types write nulls).</summary>
internal sealed class ParquetFixtureColumn<T>(string name, T[] values, Func<T, double> toDouble)
    : ParquetFixtureColumn(name)
{
    public override Column Schema => new Column<T>(Name);

    public override int Length => values.Length;

    public override void Write(RowGroupWriter rowGroup, int start, int count)
    {
        using var writer = rowGroup.NextColumn().LogicalWriter<T>();
        writer.WriteBatch(values, start, count);
    }

    public override double Expected(int row) => toDouble(values[row]);
}
