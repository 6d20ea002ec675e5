namespace GateTasks.Engine.Accumulation;

/// <summary>
/// Weight on a fine grid of edges (the reference's equal-probability grid, kept for features with a Wasserstein
/// check): <see cref="SumW"/> and <see cref="SumW2"/> per cell, the underflow first and the overflow last
/// (Edges.Length + 1 cells), and the tails' first moments beyond the outermost edges — Σw·(e₀ − x) over x &lt; e₀
/// (<see cref="BelowMoment"/>) and Σw·(x − e_last) over x ≥ e_last (<see cref="AboveMoment"/>) — with their Σw²·d².
/// </summary>
internal sealed record FineGridCells(double[] Edges, double[] SumW, double[] SumW2,
    double BelowMoment, double BelowMoment2, double AboveMoment, double AboveMoment2)
{
    /// <summary>Total weight, flows included.</summary>
    public double TotalSumW => SumW.Sum();
}
