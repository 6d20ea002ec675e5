namespace GateTasks.Engine.Samples;

/// <summary>
/// How far one streamed pass over a sample has got: rows read of the total (when every file states its row count, as
/// Parquet files do), the time since the pass started, and what the pass is for (e.g. "checking the sample").
/// </summary>
internal sealed record ReadProgress(string Phase, long RowsRead, long? RowsTotal, TimeSpan Elapsed, bool Finished)
{
    /// <summary>Rows per second so far, or NaN before any time has passed.</summary>
    public double Rate => Elapsed.TotalSeconds > 0 ? RowsRead / Elapsed.TotalSeconds : double.NaN;

    /// <summary>Estimated time left at the rate so far, or null when the total is unknown.</summary>
    public TimeSpan? Remaining => RowsTotal is { } total && Rate > 0 ? TimeSpan.FromSeconds(Math.Max(0, total - RowsRead) / Rate) : null;
}
