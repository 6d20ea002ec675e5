namespace GateTasks.Engine.Statistics;

/// <summary>χ² homogeneity result: X², degrees of freedom (bins used − 1) and p = P(χ²_ndf ≥ X²).</summary>
internal readonly record struct ChiSquareResult(double ChiSquare, int DegreesOfFreedom, double PValue);
