namespace GateTasks.Engine.Accumulation;

/// <summary>
/// A finished <see cref="SlicedHistogramCounter"/>: per projection k, its <see cref="Edges"/> and its cells packed as
/// [Σw·(e₀ − x) below, Σw of cells 0 … edges.Length (underflow first, overflow last), Σw·(x − e_last) above]
/// (<see cref="Cells"/>; the layout Wasserstein.FineGrid reads), the Σw² of the same entries (Σw²·d² for the tail
/// moments; <see cref="Squares"/>), the same packed Σw of each group of rows (<see cref="GroupCells"/>[k][g]), and the
/// weighted mean and standard deviation of the projected values (<see cref="Mean"/>, <see cref="StandardDeviation"/>;
/// a reference's σ is the unit its sliced W1 is given in).
/// </summary>
internal sealed record SlicedHistograms(double[] Directions, double[][] Edges, double[][] Cells, double[][] Squares,
    double[][][] GroupCells, double[] Mean, double[] StandardDeviation, long Rows, long Skipped)
{
    /// <summary>The number of projections K.</summary>
    public int Projections => Edges.Length;

    /// <summary>The number of groups of rows.</summary>
    public int Groups => GroupCells.Length == 0 ? 0 : GroupCells[0].Length;

    /// <summary>Projection k's total weight (its cells, flows included; not the tail moments).</summary>
    public double TotalSumW(int k)
    {
        var total = 0.0;
        var cells = Cells[k];
        for (var i = 1; i < cells.Length - 1; i++) total += cells[i];
        return total;
    }
}
